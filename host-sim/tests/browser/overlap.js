// Standfast chart check, run inside headless Chromium on a copy of a report
// page (check.sh appends this file as an inline script before </body>).
// For every <svg> on the page it takes the rendered box of each <text>
// element (getBoundingClientRect, so rotations and the page's real fonts are
// included) and reports:
//   OVERLAP    two labels whose boxes overlap by more than TOL_PX both ways;
//   STRUCK     a label crossed by a guide line (a threshold or an event
//              mark: class "threshold" or "event-mark") more than TOL_PX
//              inside its box;
//   UNLABELLED a chart with more event marks (class "event-mark") than
//              event labels (class "mark-label"): an event nobody can name.
// The result is written into the page as a pre element with the id
// standfast-overlap-check, one line each, which check.sh reads from
// Chromium's --dump-dom output:
//   CHECKED <charts> <labels>
//   OVERLAP <chart title> | "<text a>" | "<text b>" | <w>x<h> px
//   STRUCK <chart title> | "<text>" | <line class>
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
    var marks = svg.querySelectorAll(".event-mark").length;
    var markLabels = svg.querySelectorAll(".mark-label").length;
    if (marks > markLabels) {
      lines.push(
        "UNLABELLED " + title + " | " + marks + " marks, " + markLabels + " labels"
      );
    }
    for (var a = 0; a < boxes.length; a++) {
      for (var b = a + 1; b < boxes.length; b++) {
        var p = boxes[a].r;
        var q = boxes[b].r;
        var w = Math.min(p.right, q.right) - Math.max(p.left, q.left);
        var h = Math.min(p.bottom, q.bottom) - Math.max(p.top, q.top);
        if (w > TOL_PX && h > TOL_PX) {
          lines.push(
            "OVERLAP " + title + ' | "' + boxes[a].t + '" | "' + boxes[b].t +
              '" | ' + w.toFixed(1) + "x" + h.toFixed(1) + " px"
          );
        }
      }
    }
  }
  lines.unshift("CHECKED " + charts + " " + labels);
  lines.push("PAGEHEIGHT " + document.documentElement.scrollHeight);
  var pre = document.createElement("pre");
  pre.id = "standfast-overlap-check";
  pre.textContent = lines.join("\n");
  document.body.appendChild(pre);
})();
