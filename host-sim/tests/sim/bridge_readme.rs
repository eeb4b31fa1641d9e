//! The live bridge's examples in host-sim/README.md are true: each input
//! block is run through `standfast bridge` with the demo rig and the answers
//! shown are compared with what it prints (every field; numbers the README
//! rounds within 0.05).

use std::io::Write;
use std::process::{Command, Stdio};

use serde_json::Value;

/// The README's "Live bridge" section.
fn section() -> &'static str {
    let readme = include_str!("../../README.md");
    let start = readme
        .find("## Live bridge")
        .expect("a Live bridge section");
    let rest = &readme[start..];
    let end = rest[3..].find("\n## ").map_or(rest.len(), |e| e + 3);
    &rest[..end]
}

/// The fenced blocks of a language in the section, in order.
fn blocks(lang: &str) -> Vec<String> {
    let fence = format!("```{lang}\n");
    let mut out = Vec::new();
    let mut rest = section();
    while let Some(i) = rest.find(&fence) {
        let body = &rest[i + fence.len()..];
        let end = body.find("```").expect("a closed block");
        out.push(body[..end].to_owned());
        rest = &body[end + 3..];
    }
    out
}

/// Runs the bridge on the demo rig with `input`; its standard output lines.
fn bridge(input: &str) -> Vec<Value> {
    let rig = concat!(env!("CARGO_MANIFEST_DIR"), "/demo/rig.toml");
    let mut child = Command::new(env!("CARGO_BIN_EXE_standfast"))
        .args(["bridge", "--rig", rig])
        .stdin(Stdio::piped())
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .unwrap();
    child
        .stdin
        .take()
        .unwrap()
        .write_all(input.as_bytes())
        .unwrap();
    let out = child.wait_with_output().unwrap();
    assert_eq!(out.status.code(), Some(0), "{out:?}");
    String::from_utf8(out.stdout)
        .unwrap()
        .lines()
        .map(|l| serde_json::from_str(l).unwrap())
        .collect()
}

/// Whether the README's value `doc` matches the bridge's `got`.
fn matches(doc: &Value, got: &Value, path: &str) -> Result<(), String> {
    match (doc, got) {
        (Value::Object(a), Value::Object(b)) => {
            let ka: Vec<_> = a.keys().collect();
            let kb: Vec<_> = b.keys().collect();
            if ka != kb {
                return Err(format!("{path}: README keys {ka:?}, bridge keys {kb:?}"));
            }
            for (k, v) in a {
                matches(v, &b[k], &format!("{path}.{k}"))?;
            }
            Ok(())
        }
        (Value::Array(a), Value::Array(b)) if a.len() == b.len() => {
            for (i, (x, y)) in a.iter().zip(b).enumerate() {
                matches(x, y, &format!("{path}[{i}]"))?;
            }
            Ok(())
        }
        (Value::Number(a), Value::Number(b)) => {
            let (x, y) = (a.as_f64().unwrap(), b.as_f64().unwrap());
            let ok = if a.is_f64() {
                (x - y).abs() <= 0.05
            } else {
                x.to_bits() == y.to_bits()
            };
            if ok {
                Ok(())
            } else {
                Err(format!("{path}: README {a}, bridge {b}"))
            }
        }
        _ if doc == got => Ok(()),
        _ => Err(format!("{path}: README {doc}, bridge {got}")),
    }
}

#[test]
fn the_first_example_and_the_error_line_are_what_the_bridge_prints() {
    let sh = blocks("sh");
    let json = blocks("json");
    // The printf example's input lines (single-quoted JSON).
    let mut input: String = sh[0]
        .lines()
        .filter_map(|l| {
            let l = l.trim();
            let a = l.find("'{")?;
            let b = l.rfind("}'")?;
            Some(format!("{}\n", &l[a + 1..=b]))
        })
        .collect();
    assert_eq!(input.lines().count(), 2, "{input}");
    // The third line the text names for the error example.
    input.push_str("{\"t_ms\": 2000, \"wind_mps\": -1}\n");
    assert!(section().contains("`{\"t_ms\": 2000, \"wind_mps\": -1}`"));
    let out = bridge(&input);
    assert_eq!(out.len(), 3);
    let line2: Value = serde_json::from_str(&json[0]).unwrap();
    matches(&line2, &out[1], "line 2").unwrap();
    let err: Value = serde_json::from_str(&json[2]).unwrap();
    matches(&err, &out[2], "line 3").unwrap();
}

#[test]
fn the_long_example_clears_where_the_readme_says() {
    let sh = blocks("sh");
    // The generator: the block up to its pipe into cargo run.
    let generator = sh[1].split("|\n").next().unwrap().trim_end().to_owned();
    assert!(generator.starts_with("awk"), "{generator}");
    let out = Command::new("sh")
        .args(["-c", &generator])
        .output()
        .unwrap();
    assert!(out.status.success(), "{out:?}");
    let input = String::from_utf8(out.stdout).unwrap();
    let verdicts = bridge(&input);
    let doc: Value = serde_json::from_str(&blocks("json")[1]).unwrap();
    let n = usize::try_from(doc["line"].as_u64().unwrap()).unwrap();
    matches(&doc, &verdicts[n - 1], "the clear line").unwrap();
    // And it is the first clear line.
    let first_clear = verdicts.iter().position(|v| v["level"] == "clear").unwrap();
    assert_eq!(first_clear + 1, n);
}
