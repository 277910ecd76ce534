//! One shared string for each distinct text read (line ids, item texts): a register of 300,000
//! fittings on 20,000 lines holds 20,000 line-id strings, not 300,000, and the audit's results
//! share them with the rows instead of copying (docs/reliability.md, memory).

use std::collections::HashSet;
use std::sync::Arc;

/// The distinct texts seen so far, each stored once.
#[derive(Debug, Default)]
pub(super) struct Interner(HashSet<Arc<str>>);

impl Interner {
    /// The shared string equal to `text`, stored on first sight.
    pub(super) fn get(&mut self, text: String) -> Arc<str> {
        if let Some(shared) = self.0.get(text.as_str()) {
            return Arc::clone(shared);
        }
        let shared: Arc<str> = text.into();
        self.0.insert(Arc::clone(&shared));
        shared
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn equal_texts_share_one_string() {
        let mut interner = Interner::default();
        let a = interner.get("SY-000001".into());
        let b = interner.get("SY-000001".into());
        let c = interner.get("SY-000002".into());
        assert!(Arc::ptr_eq(&a, &b));
        assert!(!Arc::ptr_eq(&a, &c));
        assert_eq!((&*a, &*c), ("SY-000001", "SY-000002"));
    }
}
