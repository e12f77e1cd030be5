//! The shop file: the sine fixtures and gauge-block sets a shop has (YAML, edited by hand).
//!
//! # Where it is read from (first found wins)
//! 1. the path given with `--shop FILE` (must exist);
//! 2. the path in the `TILTBOOK_SHOP` environment variable, when set and not empty (must exist);
//! 3. `shop.yaml` in the platform's configuration folder (on Linux
//!    `$XDG_CONFIG_HOME/tiltbook/shop.yaml`, usually `~/.config/tiltbook/shop.yaml`), when it exists;
//! 4. the built-in demo shop (an invented one; the same text `tiltbook shop --init` writes).
//!
//! `tiltbook shop --init` writes the starting file to the first of 1–3 that is named (the
//! configuration folder when neither the option nor the variable is given) and never
//! overwrites a file.

mod model;
mod parse;
mod values;

pub use model::{Fixture, FixtureKind, Settings};
pub use parse::SCHEMA_VERSION;

use crate::blocks::{BlockSet, catalogue};
use std::ffi::OsString;
use std::fmt;
use std::io::Write;
use std::path::{Path, PathBuf};
use thiserror::Error;

/// The environment variable that names a shop file.
pub const ENV_VAR: &str = "TILTBOOK_SHOP";
/// The file name in the configuration folder.
pub const FILE_NAME: &str = "shop.yaml";
/// The demo shop, and the starting file `tiltbook shop --init` writes.
pub const TEMPLATE: &str = include_str!("../../sample-jobs/demo-shop.yaml");

/// Where a shop came from.
#[derive(Debug, Clone, PartialEq, Eq)]
pub enum ShopSource {
    /// `--shop FILE`.
    Option(PathBuf),
    /// The `TILTBOOK_SHOP` environment variable.
    Env(PathBuf),
    /// `shop.yaml` in the configuration folder.
    Config(PathBuf),
    /// The built-in demo shop; `config` is where a shop file would be looked for.
    BuiltIn { config: Option<PathBuf> },
}

impl ShopSource {
    /// Choose the source by the precedence above. `config_file` is the configuration folder's
    /// `shop.yaml` (if the platform has such a folder); `exists` tells whether a path exists.
    pub fn choose(
        option: Option<&Path>,
        env: Option<OsString>,
        config_file: Option<PathBuf>,
        exists: impl Fn(&Path) -> bool,
    ) -> ShopSource {
        if let Some(p) = option {
            return ShopSource::Option(p.to_path_buf());
        }
        if let Some(e) = env.filter(|e| !e.is_empty()) {
            return ShopSource::Env(PathBuf::from(e));
        }
        match config_file {
            Some(c) if exists(&c) => ShopSource::Config(c),
            c => ShopSource::BuiltIn { config: c },
        }
    }

    /// The source for this process: the option, then the environment, then the config folder.
    pub fn locate(option: Option<&Path>) -> ShopSource {
        ShopSource::choose(option, std::env::var_os(ENV_VAR), config_file(), |p| {
            p.exists()
        })
    }

    /// The file, if the shop comes from one.
    pub fn path(&self) -> Option<&Path> {
        match self {
            ShopSource::Option(p) | ShopSource::Env(p) | ShopSource::Config(p) => Some(p),
            ShopSource::BuiltIn { .. } => None,
        }
    }

    /// The file `--init` writes for this choice.
    pub fn init_target(&self) -> Option<&Path> {
        match self {
            ShopSource::BuiltIn { config } => config.as_deref(),
            other => other.path(),
        }
    }
}

impl fmt::Display for ShopSource {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            ShopSource::Option(p) => write!(f, "{} (from --shop)", p.display()),
            ShopSource::Env(p) => write!(f, "{} (from {ENV_VAR})", p.display()),
            ShopSource::Config(p) => write!(f, "{}", p.display()),
            ShopSource::BuiltIn { .. } => f.write_str("the built-in demo shop"),
        }
    }
}

/// `shop.yaml` in the platform's configuration folder, if it has one.
pub fn config_file() -> Option<PathBuf> {
    directories::ProjectDirs::from("", "", "tiltbook").map(|d| d.config_dir().join(FILE_NAME))
}

/// A shop file that cannot be used, with what to do about it.
#[derive(Debug, Clone, PartialEq, Eq, Error)]
pub enum ShopError {
    /// A mistake at a known place in the file.
    #[error("{origin}:{line}:{column}: {message}")]
    Syntax {
        origin: String,
        line: usize,
        column: usize,
        message: String,
    },
    /// A mistake about the file as a whole.
    #[error("{origin}: {message}")]
    Invalid { origin: String, message: String },
    /// The named file is not there.
    #[error(
        "there is no shop file at {path} ({how}); check the path, or write a starting file there with `tiltbook shop --init --shop {path}`"
    )]
    NotFound { path: String, how: String },
    /// The file could not be read.
    #[error("cannot read the shop file {path}: {message}")]
    Read { path: String, message: String },
    /// `--init` would overwrite a file.
    #[error(
        "a shop file already exists at {path}; tiltbook never overwrites it. Edit it in a text editor (the notes at its top explain each key), or write a new one elsewhere with `tiltbook shop --init --shop NEW.yaml`"
    )]
    Exists { path: String },
    /// The file could not be written.
    #[error("cannot write the shop file {path}: {message}")]
    Write { path: String, message: String },
    /// There is no configuration folder and no path was given.
    #[error(
        "this system has no configuration folder for tiltbook; give a path with --shop FILE or set {ENV_VAR}"
    )]
    NoConfigFolder,
}

/// The fixtures and block sets of a shop.
#[derive(Debug, Clone, PartialEq)]
pub struct Shop {
    pub source: ShopSource,
    pub fixtures: Vec<Fixture>,
    pub block_sets: Vec<BlockSet>,
    pub settings: Settings,
}

impl Shop {
    /// Load the shop: `path` is the `--shop` option (see the module notes for the precedence).
    pub fn load(path: Option<&Path>) -> Result<Shop, ShopError> {
        Shop::load_from(ShopSource::locate(path))
    }

    /// Load from a chosen source.
    pub fn load_from(source: ShopSource) -> Result<Shop, ShopError> {
        let path = match &source {
            ShopSource::BuiltIn { .. } => {
                let mut shop = Shop::built_in();
                shop.source = source;
                return Ok(shop);
            }
            ShopSource::Option(p) | ShopSource::Env(p) | ShopSource::Config(p) => p.clone(),
        };
        let how = match &source {
            ShopSource::Option(_) => "given with --shop".to_string(),
            ShopSource::Env(_) => format!("named by {ENV_VAR}"),
            _ => "in the configuration folder".to_string(),
        };
        let text = std::fs::read_to_string(&path).map_err(|e| {
            if e.kind() == std::io::ErrorKind::NotFound {
                ShopError::NotFound {
                    path: path.display().to_string(),
                    how,
                }
            } else {
                ShopError::Read {
                    path: path.display().to_string(),
                    message: e.to_string(),
                }
            }
        })?;
        Shop::parse(&text, &path.display().to_string(), source)
    }

    /// Read a shop from YAML text; `origin` names it in messages.
    pub fn parse(text: &str, origin: &str, source: ShopSource) -> Result<Shop, ShopError> {
        let (fixtures, block_sets, settings) = parse::parse(text, origin)?;
        Ok(Shop {
            source,
            fixtures,
            block_sets,
            settings,
        })
    }

    /// The invented demo shop built into tiltbook.
    pub fn built_in() -> Shop {
        match parse::parse(TEMPLATE, "built-in demo shop") {
            Ok((fixtures, block_sets, settings)) => Shop {
                source: ShopSource::BuiltIn { config: None },
                fixtures,
                block_sets,
                settings,
            },
            // the template is checked by the tests; an empty shop is the safe fallback
            Err(_) => Shop {
                source: ShopSource::BuiltIn { config: None },
                fixtures: Vec::new(),
                block_sets: Vec::new(),
                settings: Settings::default(),
            },
        }
    }

    /// The fixture with this id (ASCII case ignored).
    pub fn fixture(&self, id: &str) -> Option<&Fixture> {
        let id = id.trim();
        self.fixtures.iter().find(|f| f.id.eq_ignore_ascii_case(id))
    }

    /// The shop's block set with this id (ASCII case ignored).
    pub fn block_set(&self, id: &str) -> Option<&BlockSet> {
        let id = id.trim();
        self.block_sets
            .iter()
            .find(|s| s.id.eq_ignore_ascii_case(id))
    }

    /// The set `--set ID` names: the shop's set with that id, or else a complete standard set
    /// from the catalogue (`inch-81`, `metric-88`, `metric-112`). The flag says which.
    pub fn set_or_catalogue(&self, id: &str) -> Option<(BlockSet, SetOrigin)> {
        if let Some(s) = self.block_set(id) {
            return Some((s.clone(), SetOrigin::Shop));
        }
        BlockSet::from_catalogue(id)
            .ok()
            .map(|s| (s, SetOrigin::Catalogue))
    }

    /// The shop's sets built from the standard set `catalogue_id`.
    pub fn sets_from(&self, catalogue_id: &str) -> Vec<&BlockSet> {
        self.block_sets
            .iter()
            .filter(|s| {
                s.catalogue
                    .as_deref()
                    .is_some_and(|c| c.eq_ignore_ascii_case(catalogue_id))
            })
            .collect()
    }

    /// Every id `--set` accepts: the shop's sets, then the standard sets.
    pub fn set_ids(&self) -> Vec<String> {
        let mut v: Vec<String> = self.block_sets.iter().map(|s| s.id.clone()).collect();
        v.extend(catalogue::SET_IDS.iter().map(|s| s.to_string()));
        v
    }
}

/// Where a set named on the command line came from.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum SetOrigin {
    /// The shop file (with its missing, damaged and worn blocks).
    Shop,
    /// A complete standard set from the catalogue.
    Catalogue,
}

/// Write the starting file to `target`, never overwriting; creates the folder if needed.
pub fn write_template(target: &Path) -> Result<(), ShopError> {
    let shown = target.display().to_string();
    if target.exists() {
        return Err(ShopError::Exists { path: shown });
    }
    if let Some(dir) = target.parent().filter(|d| !d.as_os_str().is_empty()) {
        std::fs::create_dir_all(dir).map_err(|e| ShopError::Write {
            path: shown.clone(),
            message: e.to_string(),
        })?;
    }
    let mut f = std::fs::OpenOptions::new()
        .write(true)
        .create_new(true)
        .open(target)
        .map_err(|e| {
            if e.kind() == std::io::ErrorKind::AlreadyExists {
                ShopError::Exists {
                    path: shown.clone(),
                }
            } else {
                ShopError::Write {
                    path: shown.clone(),
                    message: e.to_string(),
                }
            }
        })?;
    f.write_all(TEMPLATE.as_bytes())
        .and_then(|_| f.sync_all())
        .map_err(|e| ShopError::Write {
            path: shown,
            message: e.to_string(),
        })
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn precedence_option_env_config_builtin() {
        let opt = PathBuf::from("/a/opt.yaml");
        let env = OsString::from("/b/env.yaml");
        let cfg = PathBuf::from("/c/shop.yaml");
        let yes = |_: &Path| true;
        let no = |_: &Path| false;
        assert_eq!(
            ShopSource::choose(Some(&opt), Some(env.clone()), Some(cfg.clone()), yes),
            ShopSource::Option(opt.clone())
        );
        assert_eq!(
            ShopSource::choose(None, Some(env.clone()), Some(cfg.clone()), yes),
            ShopSource::Env(PathBuf::from("/b/env.yaml"))
        );
        assert_eq!(
            ShopSource::choose(None, Some(OsString::new()), Some(cfg.clone()), yes),
            ShopSource::Config(cfg.clone())
        );
        assert_eq!(
            ShopSource::choose(None, None, Some(cfg.clone()), no),
            ShopSource::BuiltIn {
                config: Some(cfg.clone())
            }
        );
        assert_eq!(
            ShopSource::BuiltIn {
                config: Some(cfg.clone())
            }
            .init_target(),
            Some(cfg.as_path())
        );
    }
}

#[cfg(test)]
mod file_tests {
    use super::*;
    use crate::blocks::Condition;
    use crate::units::Length;

    fn parse(text: &str) -> Result<Shop, ShopError> {
        Shop::parse(text, "t.yaml", ShopSource::BuiltIn { config: None })
    }

    #[test]
    fn the_demo_shop_reads_back() {
        let shop = parse(TEMPLATE).unwrap();
        assert_eq!(shop.fixtures.len(), 6);
        assert_eq!(shop.block_sets.len(), 2);
        assert_eq!(Shop::built_in().fixtures, shop.fixtures);
        let bar = shop.fixture("sb5-117").unwrap();
        assert_eq!(bar.kind, FixtureKind::SineBar);
        assert_eq!(bar.center, Length::from_nm(127_000_508));
        let set = shop.block_set("BX81-A").unwrap();
        assert_eq!(set.blocks.len(), 81);
        assert_eq!(
            set.sizes_in(Condition::Missing),
            vec![Length::from_nm(2540 * 1007)]
        );
        assert_eq!(
            set.sizes_in(Condition::Worn),
            vec![Length::from_nm(2540 * 1010)]
        );
        assert_eq!(
            set.protectors.map(|p| p.size),
            Some(Length::from_nm(1_270_000))
        );
    }

    fn err(text: &str) -> String {
        match parse(text) {
            Ok(_) => String::from("(no error)"),
            Err(e) => e.to_string(),
        }
    }

    #[test]
    fn mistakes_are_located_and_explained() {
        let base = "fixtures:\n  - id: A\n    kind: sine bar\n    center: 5in\n    rolls: [0.75in, 0.75in]\n    calibrated: 2026-01-01\n    center_uncertainty: 0.00005in\n    largest_stack: 4in\n    angle_range: [0, 60]\n";
        assert_eq!(err(base), "(no error)");
        let e = err(&base.replace("center: 5in", "center: 5"));
        assert!(
            e.starts_with("t.yaml:4:13:") && e.contains("5in or 5mm"),
            "{e}"
        );
        let e = err(&base.replace("    kind: sine bar", "    kind: sine bars"));
        assert!(
            e.starts_with("t.yaml:3:11:") && e.contains("sine bar"),
            "{e}"
        );
        let e = err(&format!("{base}    colour: red\n"));
        assert!(
            e.starts_with("t.yaml:10:5:") && e.contains("unknown field `colour`"),
            "{e}"
        );
        let e = err(&base.replace("2026-01-01", "2026-13-01"));
        assert!(
            e.starts_with("t.yaml:6:17:") && e.contains("YYYY-MM-DD"),
            "{e}"
        );
        let e = err(&base.replace("[0, 60]", "[60, 0]"));
        assert!(
            e.starts_with("t.yaml:9:") && e.contains("smallest first"),
            "{e}"
        );
        let e = err(&base.replace("    largest_stack: 4in\n", ""));
        assert!(
            e.contains("missing field `largest_stack`") && e.contains("--init"),
            "{e}"
        );
        let dup = format!("{base}{}", &base["fixtures:\n".len()..]);
        let e = err(&dup);
        assert!(
            e.starts_with("t.yaml:10:5:") && e.contains("used twice"),
            "{e}"
        );
    }

    #[test]
    fn set_mistakes() {
        let set = "block_sets:\n  - id: S\n    catalogue: inch-81\n    missing: [0.1008in]\n";
        assert_eq!(err(set), "(no error)");
        let e = err(&set.replace("inch-81", "inch-82"));
        assert!(
            e.starts_with("t.yaml:3:16:") && e.contains("inch-81, metric-88"),
            "{e}"
        );
        let e = err(&set.replace("0.1008in", "0.1010in, 0.1010in"));
        assert!(
            e.starts_with("t.yaml:4:5:") && e.contains("0.1010 in"),
            "{e}"
        );
        let e = err("block_sets:\n  - id: S\n    grade: ISO 5\n    catalogue: inch-81\n");
        assert!(
            e.starts_with("t.yaml:3:12:") && e.contains("ASME AS-1"),
            "{e}"
        );
        let e = err("block_sets:\n  - id: S\n    sizes: [1in, 25mm]\n");
        assert!(
            e.starts_with("t.yaml:3:5:") && e.contains("unit: in"),
            "{e}"
        );
        let e = err("block_sets:\n  - id: S\n    grade: ISO 1\n");
        assert!(
            e.starts_with("t.yaml:2:5:") && e.contains("catalogue: inch-81"),
            "{e}"
        );
        let ok = parse("block_sets:\n  - id: S\n    sizes: [0.1001in, 0.050in x2, 1in]\n").unwrap();
        assert_eq!(ok.block_sets[0].blocks.len(), 4);
        let e = err("");
        assert!(e.contains("empty"), "{e}");
        let e = err("version: 2\n");
        assert!(e.contains("version 2"), "{e}");
        let e = err("fixtures:\n  - id: A\n   kind: [\n");
        assert!(e.starts_with("t.yaml:"), "{e}");
    }
}
