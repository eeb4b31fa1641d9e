//! The top-level README's rig file is the demo rig, and it loads.

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
