//! The tmux harness the end-to-end tests share: a private tmux server running the real binary,
//! keys in, screens out. Each test file uses what it needs.
#![allow(dead_code)]

use std::path::Path;
use std::process::Command;
use std::sync::atomic::{AtomicUsize, Ordering};
use std::time::{Duration, Instant};

static NEXT: AtomicUsize = AtomicUsize::new(0);

/// Is tmux installed? The end-to-end tests skip (with a message) when it is not.
pub fn tmux_available() -> bool {
    Command::new("tmux")
        .arg("-V")
        .output()
        .is_ok_and(|o| o.status.success())
}

/// A path quoted for the shell that tmux starts the command in.
pub fn quote(p: &Path) -> String {
    format!("'{}'", p.display().to_string().replace('\'', "'\\''"))
}

/// A tmux server of our own (private socket) running one command; killed when dropped.
pub struct Session {
    socket: String,
}

impl Session {
    pub fn tmux(&self, args: &[&str]) -> std::process::Output {
        Command::new("tmux")
            .args(["-L", &self.socket])
            .args(args)
            .output()
            .expect("tmux runs")
    }

    /// Start `command` in a terminal of `cols`×`rows`; `tag` names the socket.
    pub fn start(tag: &str, command: &str, cols: u16, rows: u16) -> Session {
        let n = NEXT.fetch_add(1, Ordering::SeqCst);
        let s = Session {
            socket: format!("tiltbook-e2e-{tag}-{}-{n}", std::process::id()),
        };
        let (cols, rows) = (cols.to_string(), rows.to_string());
        let out = s.tmux(&[
            "new-session",
            "-d",
            "-s",
            "main",
            "-x",
            &cols,
            "-y",
            &rows,
            command,
        ]);
        assert!(out.status.success(), "tmux new-session: {out:?}");
        s
    }

    pub fn keys(&self, keys: &[&str]) {
        let mut args = vec!["send-keys", "-t", "main"];
        args.extend_from_slice(keys);
        self.tmux(&args);
        std::thread::sleep(Duration::from_millis(120));
    }

    pub fn text(&self, text: &str) {
        self.tmux(&["send-keys", "-t", "main", "-l", "--", text]);
        std::thread::sleep(Duration::from_millis(120));
    }

    pub fn screen(&self) -> String {
        String::from_utf8_lossy(&self.tmux(&["capture-pane", "-p", "-t", "main"]).stdout)
            .into_owned()
    }

    pub fn alive(&self) -> bool {
        self.tmux(&["has-session", "-t", "main"]).status.success()
    }

    /// Wait until `text` is on screen; panic with the screen if it never comes.
    pub fn expect(&self, text: &str) {
        let end = Instant::now() + Duration::from_secs(10);
        loop {
            let s = self.screen();
            if s.contains(text) {
                return;
            }
            assert!(
                Instant::now() < end,
                "expected {text:?} on screen; the screen was:\n{s}"
            );
            std::thread::sleep(Duration::from_millis(100));
        }
    }

    /// Wait for the program to end (the session closes with it).
    pub fn wait_end(&self) {
        let end = Instant::now() + Duration::from_secs(10);
        while self.alive() {
            assert!(
                Instant::now() < end,
                "the program did not end; the screen was:\n{}",
                self.screen()
            );
            std::thread::sleep(Duration::from_millis(100));
        }
    }

    /// Tick blocks until every stack is wrung, then confirm.
    pub fn wring_all(&self) {
        self.expect("wring block 1");
        for _ in 0..14 {
            if self.screen().contains("every block is wrung") {
                break;
            }
            self.keys(&["Space"]);
        }
        self.expect("every block is wrung");
        self.keys(&["Enter"]);
    }
}

impl Drop for Session {
    fn drop(&mut self) {
        let _ = Command::new("tmux")
            .args(["-L", &self.socket, "kill-server"])
            .output();
    }
}
