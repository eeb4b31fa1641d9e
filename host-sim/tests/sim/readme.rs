//! The top-level README's rig file is the demo rig, and it loads; its
//! demo headline is the one the demo prints (tests/golden/demo-headline.txt).

use standfast_sim::input::located::SourceText;
use standfast_sim::input::rigfile;

fn readme_rig() -> String {
    let readme = include_str!("../../../README.md");
    let start = readme
        .find("## Rig file")
        .expect("README has a rig file section");
    let rest = &readme[start..];
    let open = rest.find("```toml\n").expect("a toml block") + "```toml\n".len();
    let close = rest[open..].find("```").expect("closed block");
    rest[open..open + close].to_string()
}

#[test]
fn readme_rig_file_is_the_demo_rig() {
    let demo = include_str!("../../demo/rig.toml");
    assert_eq!(
        readme_rig().trim_end(),
        demo.trim_end(),
        "README and host-sim/demo/rig.toml differ"
    );
}

#[test]
fn readme_rig_file_loads() {
    let src = SourceText::new("README.md", readme_rig());
    let loaded = rigfile::load_source(&src).expect("the README's rig file loads");
    assert!(loaded.rig.parts().len() > 5);
}

#[test]
fn readme_demo_headline_is_the_golden_one() {
    let readme = include_str!("../../../README.md");
    let golden = include_str!("../golden/demo-headline.txt");
    let start = readme
        .find("```text\nThe night in brief")
        .expect("README shows the headline")
        + "```text\n".len();
    let close = readme[start..].find("```").expect("closed block");
    assert_eq!(
        &readme[start..start + close],
        golden,
        "README and tests/golden/demo-headline.txt differ"
    );
}
