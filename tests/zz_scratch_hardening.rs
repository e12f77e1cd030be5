use std::time::Instant;
fn go(name: &str, text: &str) {
        let t = Instant::now();
        let _ = tiltbook::traveller::locate::Locator::new(text);
        eprintln!("{name} locator {:?}", t.elapsed());
        let t = Instant::now();
        let r: Result<serde_yaml::Value, _> = serde_yaml::from_str(text);
        eprintln!("{name} value {:?} {:?}", t.elapsed(), r.err().map(|e| e.to_string()));
}
#[test]
fn scratch() {
    for depth in [1000usize, 100_000] {
        let mut s = String::from("schema: 1\njob:\n");
        for i in 0..depth { s.push_str(&" ".repeat(i + 1)); s.push_str("k:\n"); }
        go(&format!("block {depth}"), &s);
        let mut s = String::from("schema: 1\njob:\n");
        for _ in 0..depth { s.push_str("- "); }
        s.push_str("x\n");
        go(&format!("dashes {depth}"), &s);
        let text = format!("schema: 1\njob: {}{}\n", "[\n".repeat(depth), "]\n".repeat(depth));
        go(&format!("multiline flow {depth}"), &text);
    }
    let line = format!("{}{}\n", "[".repeat(16), "]".repeat(16));
    let text = format!("schema: 1\nx:\n{}", format!("- {line}").repeat(200_000));
    eprintln!("{} bytes", text.len());
    go("many16", &text);
}
