//! Errors of one line that share one cause (the line's flow far out of range makes every
//! fitting on it fail the same way): the first is reported, the others are counted in it
//! ("…and 7 more fittings on line 'L1' fail the same way") instead of repeated.

use std::collections::HashMap;

use crate::error::Diagnostic;

/// The first error of each (line, reason), with how many more repeat it.
#[derive(Debug, Default)]
pub(crate) struct SameCause {
    first: HashMap<(String, String), (usize, usize)>,
}

impl SameCause {
    /// Whether an error for `why` on `line` repeats an earlier one (it is then counted, and
    /// should not be pushed); otherwise the error about to be pushed at `index` becomes the
    /// first of its kind.
    pub(crate) fn repeats(&mut self, line: &str, why: &str, index: usize) -> bool {
        match self.first.get_mut(&(line.to_string(), why.to_string())) {
            Some((_, more)) => {
                *more += 1;
                true
            }
            None => {
                self.first
                    .insert((line.to_string(), why.to_string()), (index, 0));
                false
            }
        }
    }

    /// Append the count of repeats to each first error: `…and N more ITEMs on line 'L' fail the
    /// same way`.
    pub(crate) fn fold_into(self, errors: &mut [Diagnostic], item: &str) {
        for ((line, _), (index, more)) in self.first {
            if more == 0 {
                continue;
            }
            if let Some(d) = errors.get_mut(index) {
                let s = if more == 1 { "" } else { "s" };
                let verb = if more == 1 { "fails" } else { "fail" };
                d.message.push_str(&format!(
                    " …and {more} more {item}{s} on line '{line}' {verb} the same way"
                ));
            }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::error::Severity;

    fn diag(message: &str) -> Diagnostic {
        Diagnostic {
            severity: Severity::Error,
            file: "f.xlsx".into(),
            cell: None,
            message: message.into(),
            hint: None,
        }
    }

    #[test]
    fn repeats_of_one_reason_on_one_line_are_counted_in_the_first() {
        let mut errors = Vec::new();
        let mut same = SameCause::default();
        for (line, why) in [
            ("L1", "Re"),
            ("L1", "Re"),
            ("L2", "Re"),
            ("L1", "K"),
            ("L1", "Re"),
        ] {
            if !same.repeats(line, why, errors.len()) {
                errors.push(diag(&format!("{line} {why}")));
            }
        }
        same.fold_into(&mut errors, "fitting");
        let messages: Vec<&str> = errors.iter().map(|d| d.message.as_str()).collect();
        assert_eq!(
            messages,
            [
                "L1 Re …and 2 more fittings on line 'L1' fail the same way",
                "L2 Re",
                "L1 K"
            ]
        );
    }
}
