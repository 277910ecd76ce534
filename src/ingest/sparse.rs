//! Cells stored sparsely, row by row: memory follows the number of cells, not the distance
//! between them (a register plus one stray value at `XFD1048576` holds a few thousand cells, not
//! seventeen billion).
//!
//! Layout: the rows that hold cells in ascending order, and for each row a run of (column, value)
//! pairs in ascending column order, all rows' runs back to back (compressed sparse rows). A lookup
//! first guesses that rows (and columns within a row) are contiguous, which they are for tables,
//! and falls back to a binary search.

/// Cells of one kind (values or formulas) of one sheet, by absolute zero-based position.
#[derive(Clone, Debug)]
pub struct SparseCells<T> {
    /// Rows holding at least one cell, ascending.
    rows: Vec<u32>,
    /// Where each row's cells start in `cols`/`vals`; one more entry than `rows`.
    starts: Vec<usize>,
    /// Columns, row after row, ascending within a row.
    cols: Vec<u32>,
    /// Values, in the order of `cols`.
    vals: Vec<T>,
}

impl<T> Default for SparseCells<T> {
    fn default() -> Self {
        SparseCells {
            rows: Vec::new(),
            starts: vec![0],
            cols: Vec::new(),
            vals: Vec::new(),
        }
    }
}

/// Index of `key` in an ascending slice, trying the position a contiguous run would give first.
fn find(sorted: &[u32], key: u32) -> Option<usize> {
    let first = *sorted.first()?;
    let guess = key.checked_sub(first)? as usize;
    if sorted.get(guess) == Some(&key) {
        return Some(guess);
    }
    sorted.binary_search(&key).ok()
}

impl<T> SparseCells<T> {
    /// Build from cells in any order; where a position repeats, the last cell given wins.
    pub fn from_cells(cells: Vec<(u32, u32, T)>) -> Self {
        let mut b = SparseBuilder::default();
        for (row, col, val) in cells {
            b.push(row, col, val);
        }
        b.finish()
    }

    /// Append a cell after the last one (row-major order), or replace the last one when the
    /// position is the same; the cell is handed back when it would go earlier.
    fn append(&mut self, row: u32, col: u32, val: T) -> Result<(), T> {
        let last = self
            .rows
            .last()
            .zip(self.cols.last())
            .map(|(&r, &c)| (r, c));
        match last {
            Some(p) if p == (row, col) => {
                if let Some(v) = self.vals.last_mut() {
                    *v = val;
                }
                return Ok(());
            }
            Some(p) if p > (row, col) => return Err(val),
            Some((r, _)) if r == row => {}
            _ => self.rows.push(row),
        }
        self.cols.push(col);
        self.vals.push(val);
        if self.starts.len() == self.rows.len() {
            self.starts.push(self.cols.len());
        } else if let Some(end) = self.starts.last_mut() {
            *end = self.cols.len();
        }
        Ok(())
    }

    /// Number of cells held.
    pub fn len(&self) -> usize {
        self.vals.len()
    }

    /// True when no cell is held.
    pub fn is_empty(&self) -> bool {
        self.vals.is_empty()
    }

    /// The cell at a position, if one is held.
    pub fn get(&self, row: u32, col: u32) -> Option<&T> {
        let i = find(&self.rows, row)?;
        let (a, b) = (self.starts[i], self.starts[i + 1]);
        find(&self.cols[a..b], col).map(|j| &self.vals[a + j])
    }

    /// The cells of one row, in column order (none when the row holds no cell).
    pub fn row(&self, row: u32) -> impl Iterator<Item = (u32, &T)> {
        let (a, b) = find(&self.rows, row).map_or((0, 0), |i| (self.starts[i], self.starts[i + 1]));
        self.cols[a..b].iter().copied().zip(&self.vals[a..b])
    }

    /// The rows that hold cells, ascending.
    pub fn rows(&self) -> &[u32] {
        &self.rows
    }

    /// The first row at or after `from` that holds a cell.
    pub fn next_row(&self, from: u32) -> Option<u32> {
        let i = self.rows.partition_point(|&r| r < from);
        self.rows.get(i).copied()
    }

    /// Every cell as (row, column, value), row by row.
    pub fn iter(&self) -> impl Iterator<Item = (u32, u32, &T)> {
        self.rows.iter().enumerate().flat_map(move |(i, &r)| {
            let (a, b) = (self.starts[i], self.starts[i + 1]);
            self.cols[a..b]
                .iter()
                .zip(&self.vals[a..b])
                .map(move |(&c, v)| (r, c, v))
        })
    }

    /// First and one-past-last used row, when any cell is held.
    pub fn row_span(&self) -> Option<(u32, u32)> {
        Some((*self.rows.first()?, *self.rows.last()? + 1))
    }

    /// First and one-past-last used column, when any cell is held.
    pub fn col_span(&self) -> Option<(u32, u32)> {
        let lo = (0..self.rows.len())
            .filter_map(|i| self.cols.get(self.starts[i]))
            .min()?;
        let hi = (0..self.rows.len())
            .filter_map(|i| self.cols[self.starts[i]..self.starts[i + 1]].last())
            .max()?;
        Some((*lo, hi + 1))
    }

    /// Set one cell (for cells written in code; each call may move the cells after it).
    pub fn set(&mut self, row: u32, col: u32, val: T) {
        let i = self.rows.partition_point(|&r| r < row);
        if self.rows.get(i) != Some(&row) {
            self.rows.insert(i, row);
            self.starts.insert(i, self.starts[i]);
        }
        let (a, b) = (self.starts[i], self.starts[i + 1]);
        let j = a + self.cols[a..b].partition_point(|&c| c < col);
        if j < b && self.cols[j] == col {
            self.vals[j] = val;
            return;
        }
        self.cols.insert(j, col);
        self.vals.insert(j, val);
        for s in &mut self.starts[i + 1..] {
            *s += 1;
        }
    }
}

/// Collects cells as a reader yields them: in row-major order (as spreadsheet applications write
/// them) they are appended directly; any out of order are set aside and sorted in once at the end,
/// so a file listing its cells backwards costs a sort, not a quadratic number of moves.
#[derive(Debug)]
pub struct SparseBuilder<T> {
    cells: SparseCells<T>,
    late: Vec<(u32, u32, T)>,
}

impl<T> Default for SparseBuilder<T> {
    fn default() -> Self {
        SparseBuilder {
            cells: SparseCells::default(),
            late: Vec::new(),
        }
    }
}

impl<T> SparseBuilder<T> {
    /// Add a cell; a later cell at the same position replaces an earlier one.
    pub fn push(&mut self, row: u32, col: u32, val: T) {
        let val = if self.late.is_empty() {
            match self.cells.append(row, col, val) {
                Ok(()) => return,
                Err(v) => v,
            }
        } else {
            val
        };
        // Once one cell came out of order, later ones join it (same position: later wins).
        self.late.push((row, col, val));
    }

    /// Cells added so far.
    pub fn len(&self) -> usize {
        self.cells.len() + self.late.len()
    }

    /// True when nothing was added.
    pub fn is_empty(&self) -> bool {
        self.len() == 0
    }

    /// The cells, sorted.
    pub fn finish(self) -> SparseCells<T> {
        if self.late.is_empty() {
            return self.cells;
        }
        let SparseCells {
            rows,
            starts,
            cols,
            vals,
        } = self.cells;
        let mut all: Vec<(u32, u32, T)> = Vec::with_capacity(vals.len() + self.late.len());
        let mut cols = cols.into_iter();
        let mut vals = vals.into_iter();
        for (i, &r) in rows.iter().enumerate() {
            for _ in starts[i]..starts[i + 1] {
                if let (Some(c), Some(v)) = (cols.next(), vals.next()) {
                    all.push((r, c, v));
                }
            }
        }
        all.extend(self.late);
        // Stable: of two cells at one position the later stays later, and wins when appended.
        all.sort_by_key(|c| (c.0, c.1));
        let mut out = SparseCells::default();
        for (r, c, v) in all {
            // Sorted, so every cell appends.
            let _ = out.append(r, c, v);
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn far_apart_cells_cost_only_themselves() {
        let c = SparseCells::from_cells(vec![
            (1_048_575, 16_383, "far"),
            (0, 0, "a"),
            (0, 2, "c"),
            (1, 1, "b"),
            (0, 2, "c2"),
        ]);
        assert_eq!(c.len(), 4);
        assert_eq!(c.get(0, 2), Some(&"c2"));
        assert_eq!(c.get(1_048_575, 16_383), Some(&"far"));
        assert_eq!(c.get(0, 1), None);
        assert_eq!(c.get(7, 0), None);
        assert_eq!(c.rows(), &[0, 1, 1_048_575]);
        assert_eq!(c.row_span(), Some((0, 1_048_576)));
        assert_eq!(c.col_span(), Some((0, 16_384)));
        assert_eq!(c.next_row(2), Some(1_048_575));
        assert_eq!(c.row(0).map(|(c, _)| c).collect::<Vec<_>>(), vec![0, 2]);
        let all: Vec<_> = c.iter().map(|(r, c, v)| (r, c, *v)).collect();
        assert_eq!(all[3], (1_048_575, 16_383, "far"));
    }

    #[test]
    fn set_keeps_rows_and_columns_in_order() {
        let mut c = SparseCells::from_cells(vec![(2, 2, 1), (5, 0, 2)]);
        c.set(2, 0, 3);
        c.set(3, 9, 4);
        c.set(2, 2, 5);
        c.set(0, 0, 6);
        let all: Vec<_> = c.iter().map(|(r, c, v)| (r, c, *v)).collect();
        assert_eq!(
            all,
            vec![(0, 0, 6), (2, 0, 3), (2, 2, 5), (3, 9, 4), (5, 0, 2)]
        );
        assert_eq!(c.get(3, 9), Some(&4));
        assert!(SparseCells::<u8>::default().get(0, 0).is_none());
    }
}
