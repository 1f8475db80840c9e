//! Row filters, applied before checking: depth, width, grade, stock and
//! a name glob.

use crate::catalog::Row;
use serde::Serialize;

/// Row filters, applied before checking.
#[derive(Clone, Debug, Default, Serialize)]
pub struct Filters {
    pub max_depth: Option<f64>,
    pub min_depth: Option<f64>,
    pub max_width: Option<f64>,
    pub grade: Option<String>,
    pub in_stock_only: bool,
    /// Glob on the name: `*` any run, `?` one character.
    pub name: Option<String>,
}

/// Simple glob match (`*`, `?`), case-insensitive.
pub fn glob(pattern: &str, s: &str) -> bool {
    let p: Vec<char> = pattern.to_lowercase().chars().collect();
    let t: Vec<char> = s.to_lowercase().chars().collect();
    let (mut pi, mut ti, mut star, mut mark) = (0usize, 0usize, None, 0usize);
    while ti < t.len() {
        if pi < p.len() && (p[pi] == '?' || p[pi] == t[ti]) {
            pi += 1;
            ti += 1;
        } else if pi < p.len() && p[pi] == '*' {
            star = Some(pi);
            mark = ti;
            pi += 1;
        } else if let Some(s) = star {
            pi = s + 1;
            mark += 1;
            ti = mark;
        } else {
            return false;
        }
    }
    while pi < p.len() && p[pi] == '*' {
        pi += 1;
    }
    pi == p.len()
}

impl Filters {
    /// The filters in words (empty when none is set), e.g. "in stock only,
    /// depth at most 350 mm".
    pub fn describe(&self, sys: crate::units::System) -> Vec<String> {
        let mm = |v: f64| crate::units::Show::Dimension.fmt(v, sys);
        let mut out = Vec::new();
        if let Some(v) = self.max_depth {
            out.push(format!("depth at most {}", mm(v)));
        }
        if let Some(v) = self.min_depth {
            out.push(format!("depth at least {}", mm(v)));
        }
        if let Some(v) = self.max_width {
            out.push(format!("width at most {}", mm(v)));
        }
        if let Some(g) = &self.grade {
            out.push(format!("grade {g}"));
        }
        if self.in_stock_only {
            out.push("in stock only".into());
        }
        if let Some(n) = &self.name {
            out.push(format!("names matching '{n}'"));
        }
        out
    }

    pub(crate) fn admits(&self, row: &Row<'_>) -> bool {
        let d = row.props.depth;
        if self.max_depth.is_some_and(|m| d > m * (1.0 + 1e-12)) {
            return false;
        }
        if self.min_depth.is_some_and(|m| d < m * (1.0 - 1e-12)) {
            return false;
        }
        if self
            .max_width
            .is_some_and(|m| row.props.width > m * (1.0 + 1e-12))
        {
            return false;
        }
        if let Some(g) = &self.grade
            && !row.grade.eq_ignore_ascii_case(g)
        {
            return false;
        }
        if self.in_stock_only && row.stock != Some(true) {
            return false;
        }
        if let Some(p) = &self.name
            && !glob(p, row.name)
        {
            return false;
        }
        true
    }
}
