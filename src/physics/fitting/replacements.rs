//! Lower-loss replacements of fitting kinds: for each kind a fitter would commonly swap, the
//! catalogue kinds to weigh in its place and the words that name the change. The energy review
//! (`audit::energy`) prices the best of them at the item's own flow and bore.
//!
//! Source: common practice of pipework design (like-for-like swaps in the same bore and
//! service: long-radius for short-radius elbows, full-bore for reduced-bore valves, swept tees,
//! radiused entrances, tapered area changes); no published table. Whether a swap suits an item
//! (space, pressure class, the valve's duty) is for the engineer to judge: the suggestion says so.

use super::{Group, Kind};

/// Which kinds a replacement applies to.
enum Applies {
    /// These kind ids.
    Kinds(&'static [&'static str]),
    /// Every kind of this group.
    Group(Group),
}

/// A lower-loss replacement of a kind.
#[derive(Debug, PartialEq, Eq)]
pub struct Replacement {
    /// Catalogue kind ids to weigh in the item's place (the lowest head at the item's flow is
    /// the suggestion); the item's own kind is skipped.
    pub kinds: &'static [&'static str],
    /// What the change is, in words (the chosen kind id is appended in brackets).
    pub words: &'static str,
}

/// The replacement table, first match wins.
const TABLE: &[(Applies, Replacement)] = &[
    (
        Applies::Kinds(&[
            "elbow-90",
            "elbow-90-threaded",
            "mitre-90-1weld",
            "mitre-90-2weld",
            "mitre-90-3weld",
            "mitre-90-4weld",
            "mitre-90-5weld",
        ]),
        Replacement {
            kinds: &["elbow-90-long"],
            words: "long-radius 90° elbow",
        },
    ),
    (
        Applies::Kinds(&["elbow-180", "elbow-180-threaded"]),
        Replacement {
            kinds: &["elbow-180-long"],
            words: "long-radius return",
        },
    ),
    (
        Applies::Kinds(&["elbow-45-threaded", "mitre-45-1weld", "mitre-45-2weld"]),
        Replacement {
            kinds: &["elbow-45"],
            words: "butt-weld 45° elbow",
        },
    ),
    (
        Applies::Kinds(&["tee-branch", "tee-branch-threaded", "tee-branch-stub-in"]),
        Replacement {
            kinds: &["tee-branch-swept"],
            words: "swept tee",
        },
    ),
    (
        Applies::Kinds(&[
            "valve-globe",
            "valve-globe-bevel-seat",
            "valve-globe-composition-seat",
            "valve-globe-y",
            "valve-angle",
        ]),
        Replacement {
            kinds: &["valve-gate", "valve-ball"],
            words: "full-bore valve where the valve only isolates",
        },
    ),
    (
        Applies::Kinds(&["valve-ball-reduced"]),
        Replacement {
            kinds: &["valve-ball"],
            words: "full-bore ball valve",
        },
    ),
    (
        Applies::Kinds(&["valve-plug-reduced"]),
        Replacement {
            kinds: &["valve-plug"],
            words: "full-bore plug valve",
        },
    ),
    (
        Applies::Kinds(&["entrance-square-edged", "entrance-projecting"]),
        Replacement {
            kinds: &["entrance-radiused"],
            words: "radiused (bell-mouth) entrance",
        },
    ),
    (
        Applies::Kinds(&["expansion"]),
        Replacement {
            kinds: &["expansion-tapered"],
            words: "tapered expansion (diffuser)",
        },
    ),
    (
        Applies::Kinds(&["contraction"]),
        Replacement {
            kinds: &["contraction-tapered"],
            words: "tapered contraction",
        },
    ),
    (
        Applies::Group(Group::CheckValve),
        Replacement {
            kinds: &["check-swing", "check-lift", "check-tilting-disc"],
            words: "lower-loss check valve type; confirm its closing against surge",
        },
    ),
];

impl Kind {
    /// The lower-loss replacement commonly fitted instead of this kind, if any.
    ///
    /// # Example
    /// ```
    /// use lossledger::physics::fitting::find_kind;
    /// let r = find_kind("elbow-90").and_then(|k| k.replacement()).expect("a swap");
    /// assert_eq!(r.kinds, ["elbow-90-long"]);
    /// assert!(find_kind("elbow-90-long").and_then(|k| k.replacement()).is_none());
    /// ```
    pub fn replacement(&self) -> Option<&'static Replacement> {
        TABLE
            .iter()
            .find(|(applies, _)| match applies {
                Applies::Kinds(ids) => ids.contains(&self.id),
                Applies::Group(g) => self.group == *g,
            })
            .map(|(_, r)| r)
    }

    /// Whether the kind joins two bores (expansions, contractions, reducers, diffusers): its
    /// inlet and outlet sizes both matter.
    pub fn changes_area(&self) -> bool {
        self.group == Group::AreaChange
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::physics::fitting::{catalogue, find_kind};

    /// Every kind the table names, as applying or as replacing, is in the catalogue: a renamed
    /// kind would otherwise silently drop its suggestion.
    #[test]
    fn every_named_kind_is_in_the_catalogue() {
        for (applies, r) in TABLE {
            if let Applies::Kinds(ids) = applies {
                for id in *ids {
                    assert!(find_kind(id).is_some(), "{id} applies but is not a kind");
                }
            }
            for id in r.kinds {
                assert!(find_kind(id).is_some(), "{id} replaces but is not a kind");
            }
        }
    }

    /// A replacement never replaces a kind with itself only, and no kind is listed twice (the
    /// second row would never be reached).
    #[test]
    fn rows_are_reachable_and_change_something() {
        let mut seen = std::collections::HashSet::new();
        for (applies, r) in TABLE {
            if let Applies::Kinds(ids) = applies {
                for id in *ids {
                    assert!(seen.insert(*id), "{id} listed twice");
                    assert!(r.kinds.iter().any(|k| k != id), "{id} only replaces itself");
                }
            }
        }
    }

    /// The catalogue's area changes are the six kinds that join two bores (fact of the trade:
    /// an expansion, contraction or reducer has an inlet and an outlet size); the same-size
    /// check and the list reader rely on it.
    #[test]
    fn area_changes_are_the_two_bore_kinds() {
        let ids: Vec<&str> = catalogue()
            .iter()
            .filter(|k| k.changes_area())
            .map(|k| k.id)
            .collect();
        assert_eq!(
            ids,
            [
                "expansion",
                "contraction",
                "contraction-radiused",
                "contraction-tapered",
                "expansion-tapered",
                "reducer"
            ]
        );
    }
}
