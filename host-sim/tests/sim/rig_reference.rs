//! host-sim/RIG-FILE.md against the rig loader: the loader is asked which
//! keys it accepts in every table (an unknown key is refused with the list
//! of keys accepted there), tables are found by probing each key as a table
//! and as a repeated table, and the whole tree must equal the keys the
//! reference lists, no more and no fewer.

use std::collections::BTreeSet;
use std::path::Path;

/// A key path: names, each marked when it is a repeated table (`[[...]]`).
type KeyPath = Vec<(String, bool)>;

/// The path as the reference writes it: `body[].shape.kind`.
fn written(p: &KeyPath) -> String {
    p.iter()
        .map(|(n, arr)| if *arr { format!("{n}[]") } else { n.clone() })
        .collect::<Vec<_>>()
        .join(".")
}

/// A rig file that opens every table of `p` and writes one unknown key in
/// the last.
fn probe_text(p: &KeyPath) -> String {
    let mut s = String::new();
    for k in 1..=p.len() {
        let name = p[..k]
            .iter()
            .map(|(n, _)| n.as_str())
            .collect::<Vec<_>>()
            .join(".");
        if p[k - 1].1 {
            s.push_str(&format!("[[{name}]]\n"));
        } else {
            s.push_str(&format!("[{name}]\n"));
        }
    }
    s.push_str("zz_probe = 1\n");
    s
}

/// The keys the loader accepts in table `p`, when it is a table (the
/// message "…zz_probe: unknown key (accepted here: a, b)").
fn accepted(dir: &Path, p: &KeyPath) -> Option<Vec<String>> {
    let file = dir.join("probe.toml");
    std::fs::write(&file, probe_text(p)).unwrap();
    let err = match standfast_sim::input::rigfile::load(&file) {
        Ok(_) => panic!("a probe loaded: {}", probe_text(p)),
        Err(e) => e.to_string(),
    };
    let want = {
        let mut w = String::new();
        for (i, (n, arr)) in p.iter().enumerate() {
            if i > 0 {
                w.push('.');
            }
            w.push_str(n);
            if *arr {
                w.push_str("[0]");
            }
        }
        if w.is_empty() {
            "zz_probe: unknown key".to_owned()
        } else {
            format!("{w}.zz_probe: unknown key")
        }
    };
    if !err.contains(&format!(" {want}")) {
        return None;
    }
    let list = err.split("accepted here: ").nth(1)?.split(')').next()?;
    Some(list.split(", ").map(str::to_owned).collect())
}

/// Every key path the loader accepts, tables included.
fn loader_keys(dir: &Path) -> BTreeSet<String> {
    let mut out = BTreeSet::new();
    let mut todo: Vec<KeyPath> = vec![Vec::new()];
    while let Some(table) = todo.pop() {
        let keys = accepted(dir, &table).expect("a table answers with its keys");
        for k in keys {
            let mut as_array = table.clone();
            as_array.push((k.clone(), true));
            let mut as_table = table.clone();
            as_table.push((k.clone(), false));
            // `log` holds a log profile, which the rig loader ignores.
            if table.is_empty() && k == "log" {
                out.insert(written(&as_table));
                continue;
            }
            // A table first: serde would also read a struct from a list
            // (its fields by position), so the list probe comes second.
            if accepted(dir, &as_table).is_some() {
                out.insert(written(&as_table));
                todo.push(as_table);
            } else if accepted(dir, &as_array).is_some() {
                out.insert(written(&as_array).trim_end_matches("[]").to_owned());
                todo.push(as_array);
            } else {
                out.insert(written(&as_table));
            }
        }
    }
    out
}

/// The keys host-sim/RIG-FILE.md lists: the first cell of each table row.
fn reference_keys() -> BTreeSet<String> {
    let text = include_str!("../../RIG-FILE.md");
    text.lines()
        .filter_map(|l| l.strip_prefix("| `"))
        .filter_map(|l| l.split('`').next())
        .map(str::to_owned)
        .collect()
}

#[test]
fn the_reference_lists_exactly_the_keys_the_loader_accepts() {
    let dir = tempfile::tempdir().unwrap();
    let loader = loader_keys(dir.path());
    let reference = reference_keys();
    // Sanity: the probe found the nested tables.
    for k in [
        "support.tripod.leg_spread",
        "body[].shape.kind",
        "drives.secondary.rated",
    ] {
        assert!(loader.contains(k), "{k} in {loader:?}");
    }
    let missing: Vec<_> = loader.difference(&reference).collect();
    let extra: Vec<_> = reference.difference(&loader).collect();
    assert!(
        missing.is_empty() && extra.is_empty(),
        "host-sim/RIG-FILE.md is out of date.\n  accepted by the loader but not listed: {missing:?}\n  listed but not accepted: {extra:?}"
    );
}

#[test]
fn every_listed_key_has_a_unit_a_default_and_a_description() {
    let text = include_str!("../../RIG-FILE.md");
    for l in text.lines().filter(|l| l.starts_with("| `")) {
        // "| key | unit | default | range | what |": 7 pieces around 6 bars.
        let cells: Vec<&str> = l.split('|').map(str::trim).collect();
        assert_eq!(cells.len(), 7, "{l}");
        assert!(!cells[2].is_empty(), "no unit: {l}");
        assert!(!cells[3].is_empty(), "no default: {l}");
        assert!(!cells[5].is_empty(), "no description: {l}");
    }
}
