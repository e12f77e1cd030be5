//! When someone else has the job open: who, on which computer, since when, and what can be done
//! (look read-only; take over a lock its process left behind). Shown as plain text, because the
//! job is opened before the full screen starts.

use crate::store::{Liveness, LockInfo};
use unicode_width::UnicodeWidthStr;

/// A path as typed on a command line (quoted when it holds spaces or quotes).
pub fn shell_word(path: &str) -> String {
    if !path.is_empty()
        && path
            .chars()
            .all(|c| c.is_ascii_alphanumeric() || "/._-+:@%,=".contains(c))
    {
        path.to_string()
    } else {
        format!("'{}'", path.replace('\'', "'\\''"))
    }
}

/// The command that opens the job again with `extra` options.
fn command(file: &str, review: bool, extra: &str) -> String {
    let review = if review { " --review" } else { "" };
    format!("tiltbook open {}{review} {extra}", shell_word(file))
}

/// The message for a job someone else holds. `live` says whether the holder's process is still
/// there; `review` keeps `--review` in the commands offered.
pub fn locked_message(file: &str, holder: &LockInfo, live: Liveness, review: bool) -> String {
    let since = holder.since.short();
    let read_only = command(file, review, "--read-only");
    match live {
        Liveness::Stale => format!(
            "{file} was left open by {} on {} since {since}; that process ({}) has ended, so \
             nobody is working on it now. The lock can be taken over; the takeover is recorded \
             in the job's log.\n  take it over with:   {}\n  open read-only with: {read_only}",
            holder.who,
            holder.host,
            holder.pid,
            command(file, review, "--take-over"),
        ),
        Liveness::Live | Liveness::Unknown => {
            let elsewhere = if live == Liveness::Unknown {
                " (on another computer: whether it is still open there cannot be checked from here)"
            } else {
                ""
            };
            format!(
                "{file} is open by {} on {} since {since} (process {}){elsewhere}. One person \
                 works a job at a time: ask {} to close it, or look without changing anything.\n  \
                 open read-only with: {read_only}",
                holder.who, holder.host, holder.pid, holder.who,
            )
        }
    }
}

/// The question asked before taking over a stale lock.
pub fn take_over_question(holder: &LockInfo) -> String {
    format!(
        "Take over {}'s lock and open the job for work? [y/N] ",
        holder.who
    )
}

/// Is this answer a yes? (Anything else, an empty line included, is no.)
pub fn is_yes(answer: &str) -> bool {
    matches!(answer.trim().to_ascii_lowercase().as_str(), "y" | "yes")
}

/// Text wrapped to `width` columns, word by word; lines that start with a space (commands to
/// copy) are kept whole.
pub fn wrap_message(text: &str, width: usize) -> String {
    let width = width.max(20);
    let mut out: Vec<String> = Vec::new();
    for para in text.lines() {
        if para.starts_with(' ') || para.width() <= width {
            out.push(para.to_string());
            continue;
        }
        let mut line = String::new();
        for word in para.split(' ').filter(|w| !w.is_empty()) {
            if !line.is_empty() && line.width() + 1 + word.width() > width {
                out.push(std::mem::take(&mut line));
            }
            if !line.is_empty() {
                line.push(' ');
            }
            line.push_str(word);
        }
        out.push(line);
    }
    out.join("\n")
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn paths_are_quoted_only_when_needed() {
        assert_eq!(shell_word("jobs/J-2417.yaml"), "jobs/J-2417.yaml");
        assert_eq!(shell_word("my jobs/a.yaml"), "'my jobs/a.yaml'");
        assert_eq!(shell_word("it's.yaml"), "'it'\\''s.yaml'");
    }

    #[test]
    fn only_y_or_yes_is_yes() {
        assert!(is_yes("y\n") && is_yes(" YES "));
        assert!(!is_yes("") && !is_yes("n") && !is_yes("yep"));
    }

    #[test]
    fn wrapping_keeps_commands_whole() {
        let w = wrap_message(
            "one two three four five six\n  tiltbook open x --read-only",
            20,
        );
        assert_eq!(
            w,
            "one two three four\nfive six\n  tiltbook open x --read-only"
        );
    }
}
