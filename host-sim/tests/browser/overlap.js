// Standfast chart check, run inside headless Chromium on a copy of a report
// page (check.sh appends this file as an inline script before </body>).
// For every <svg> on the page it takes the rendered box of each <text>
// element (getBoundingClientRect, so rotations and the page's real fonts are
// included) and reports:
//   OVERLAP    two labels whose boxes overlap by more than TOL_PX both ways;
//   STRUCK     a label crossed by a guide line (a threshold or an event
//              mark: class "threshold" or "event-mark") more than TOL_PX
//              inside its box;
//   UNLABELLED an event mark (class "event-mark") no label names: marks
//              with data-event="n" need a visible label (class "mark-label")
//              whose data-events lists n; without numbers, a chart with
//              more marks than labels fails.
// The result is written into the page as a pre element with the id
// standfast-overlap-check, one line each, which check.sh reads from
// Chromium's --dump-dom output:
//   CHECKED <charts> <labels>
//   OVERLAP <chart title> | "<text a>" | "<text b>" | <w>x<h> px
//   STRUCK <chart title> | "<text>" | <line class>
//   UNLABELLED <chart title> | events <n, ...> have no label
//   UNLABELLED <chart title> | <marks> marks, <labels> labels
//   PAGEHEIGHT <pixels> (for the full-page screenshot)
(function () {
  // Tolerance, CSS pixels. A glyph box includes the font's ascent and
  // descent, so two lines of text set one line-height apart touch; an
  // overlap of more than 1.5 px in both directions means glyphs collide.
  var TOL_PX = 1.5;
  var lines = [];
  var charts = 0;
  var labels = 0;
  var svgs = document.querySelectorAll("svg");
  for (var s = 0; s < svgs.length; s++) {
    var svg = svgs[s];
    charts++;
    var title = svg.getAttribute("aria-label") || "chart " + (s + 1);
    var texts = svg.querySelectorAll("text");
    var boxes = [];
    for (var i = 0; i < texts.length; i++) {
      var r = texts[i].getBoundingClientRect();
      var t = texts[i].textContent.trim();
      if (r.width > 0 && r.height > 0 && t.length > 0) {
        boxes.push({ t: t, r: r });
      }
    }
    labels += boxes.length;
    var guides = svg.querySelectorAll("line.threshold, line.event-mark");
    for (var g = 0; g < guides.length; g++) {
      var L = guides[g].getBoundingClientRect();
      for (var k = 0; k < boxes.length; k++) {
        var T = boxes[k].r;
        if (
          L.left <= T.right - TOL_PX && L.right >= T.left + TOL_PX &&
          L.top <= T.bottom - TOL_PX && L.bottom >= T.top + TOL_PX
        ) {
          lines.push(
            "STRUCK " + title + ' | "' + boxes[k].t + '" | ' +
              guides[g].getAttribute("class")
          );
        }
      }
    }
    // Every event mark must be named by a label: by number when the marks
    // carry data-event and the labels data-events (a label may name a run
    // of close events), else by count.
    var markEls = svg.querySelectorAll(".event-mark");
    var labelEls = svg.querySelectorAll(".mark-label");
    var named = {};
    var numbered = markEls.length > 0;
    for (var m = 0; m < markEls.length; m++) {
      if (!markEls[m].hasAttribute("data-event")) numbered = false;
    }
    for (var l = 0; l < labelEls.length; l++) {
      var ev = (labelEls[l].getAttribute("data-events") || "").split(" ");
      var box = labelEls[l].getBoundingClientRect();
      if (box.width <= 0 || labelEls[l].textContent.trim() === "") continue;
      for (var e = 0; e < ev.length; e++) named[ev[e]] = true;
    }
    if (numbered) {
      var missing = [];
      for (var m2 = 0; m2 < markEls.length; m2++) {
        var id = markEls[m2].getAttribute("data-event");
        if (!named[id]) missing.push(id);
      }
      if (missing.length > 0) {
        lines.push("UNLABELLED " + title + " | events " + missing.join(", ") + " have no label");
      }
    } else if (markEls.length > labelEls.length) {
      lines.push(
        "UNLABELLED " + title + " | " + markEls.length + " marks, " + labelEls.length + " labels"
      );
    }
  }
  lines.unshift("CHECKED " + charts + " " + labels);
  lines.push("PAGEHEIGHT " + document.documentElement.scrollHeight);
  var pre = document.createElement("pre");
  pre.id = "standfast-overlap-check";
  pre.textContent = lines.join("\n");
  document.body.appendChild(pre);
})();
