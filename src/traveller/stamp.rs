//! A moment with the UTC offset it was recorded in: `2025-03-04T14:05:09-05:00`.
//!
//! The instant orders events; the offset keeps the wall-clock time the person saw.

use jiff::fmt::temporal::{Pieces, PiecesOffset};
use jiff::tz::{Offset, TimeZone};
use jiff::{Timestamp, Zoned};
use serde::{Deserialize, Serialize};
use std::cmp::Ordering;
use std::fmt;
use std::str::FromStr;
use thiserror::Error;

/// A moment, whole seconds, with its UTC offset.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub struct Stamp {
    ts: Timestamp,
    offset: Offset,
}

/// What was wrong with a written time.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
#[error(
    "'{0}' is not a time with its UTC offset; write it as 2025-03-04T14:05:09-05:00 (or ...Z for UTC)"
)]
pub struct StampError(pub String);

impl Stamp {
    /// Now, in the computer's time zone, to the whole second.
    pub fn now() -> Self {
        let z = Zoned::now();
        Self::from_parts(z.timestamp(), z.offset())
    }
    /// A given instant shown at a given offset (truncated to the whole second).
    pub fn from_parts(ts: Timestamp, offset: Offset) -> Self {
        let ts = Timestamp::from_second(ts.as_second()).unwrap_or(ts);
        Stamp { ts, offset }
    }
    /// The instant.
    pub fn timestamp(&self) -> Timestamp {
        self.ts
    }
    /// The UTC offset the time was recorded in.
    pub fn offset(&self) -> Offset {
        self.offset
    }
    /// The local date and time as written, e.g. `2025-03-04 14:05`.
    pub fn short(&self) -> String {
        self.ts
            .to_zoned(TimeZone::fixed(self.offset))
            .strftime("%Y-%m-%d %H:%M")
            .to_string()
    }
    /// The calendar date at the recorded offset.
    pub fn date(&self) -> jiff::civil::Date {
        self.ts.to_zoned(TimeZone::fixed(self.offset)).date()
    }
    /// Parse RFC 3339 text with an offset (`Z` or `±hh:mm`).
    pub fn parse(text: &str) -> Result<Self, StampError> {
        let bad = || StampError(text.to_string());
        let s = text.trim();
        let ts: Timestamp = s.parse().map_err(|_| bad())?;
        let pieces = Pieces::parse(s).map_err(|_| bad())?;
        let offset = match pieces.offset() {
            Some(PiecesOffset::Numeric(n)) => n.offset(),
            Some(PiecesOffset::Zulu) => Offset::UTC,
            _ => return Err(bad()),
        };
        Ok(Self::from_parts(ts, offset))
    }
}

impl fmt::Display for Stamp {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        let z = self.ts.to_zoned(TimeZone::fixed(self.offset));
        write!(f, "{}", z.strftime("%Y-%m-%dT%H:%M:%S%:z"))
    }
}

impl FromStr for Stamp {
    type Err = StampError;
    fn from_str(s: &str) -> Result<Self, Self::Err> {
        Stamp::parse(s)
    }
}

impl PartialOrd for Stamp {
    fn partial_cmp(&self, other: &Self) -> Option<Ordering> {
        Some(self.cmp(other))
    }
}
impl Ord for Stamp {
    /// By instant; the same instant written at two offsets orders by offset only to be total.
    fn cmp(&self, other: &Self) -> Ordering {
        self.ts
            .cmp(&other.ts)
            .then(self.offset.seconds().cmp(&other.offset.seconds()))
    }
}

impl Serialize for Stamp {
    fn serialize<S: serde::Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        s.serialize_str(&self.to_string())
    }
}
impl<'de> Deserialize<'de> for Stamp {
    fn deserialize<D: serde::Deserializer<'de>>(d: D) -> Result<Self, D::Error> {
        let s = String::deserialize(d)?;
        Stamp::parse(&s).map_err(serde::de::Error::custom)
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn keeps_the_offset_it_was_written_with() {
        let s = Stamp::parse("2025-03-04T14:05:09-05:00").unwrap();
        assert_eq!(s.to_string(), "2025-03-04T14:05:09-05:00");
        assert_eq!(s.short(), "2025-03-04 14:05");
        let z = Stamp::parse("2025-03-04T19:05:09Z").unwrap();
        assert_eq!(z.to_string(), "2025-03-04T19:05:09+00:00");
        assert_eq!(z.timestamp(), s.timestamp());
    }

    #[test]
    fn refuses_a_time_without_offset() {
        for bad in ["2025-03-04T14:05:09", "yesterday", "2025-03-04"] {
            let e = Stamp::parse(bad)
                .err()
                .map(|e| e.to_string())
                .unwrap_or_default();
            assert!(e.contains("UTC offset"), "{bad}: {e}");
        }
    }
}
