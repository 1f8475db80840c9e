//! Row filters, applied before checking: depth, width, grade, stock and
//! a name glob.

use crate::catalog::Row;
use crate::error::{Error, Result};
use crate::job::Job;
use crate::units::{self, Dim};
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

impl Filters {
    /// The filters from the values as typed: lengths with units (errors
    /// name `--max-depth`, `--min-depth`, `--max-width`).
    pub fn parse(
        max_depth: Option<&str>,
        min_depth: Option<&str>,
        max_width: Option<&str>,
        grade: Option<String>,
        in_stock_only: bool,
        name: Option<String>,
    ) -> Result<Filters> {
        Ok(Filters {
            max_depth: units::parse_field(max_depth, Dim::Length, "--max-depth")?,
            min_depth: units::parse_field(min_depth, Dim::Length, "--min-depth")?,
            max_width: units::parse_field(max_width, Dim::Length, "--max-width")?,
            grade,
            in_stock_only,
            name,
        })
    }

    /// A grade filter the job does not define can match no row (rows
    /// naming it are refused): it is refused rather than filtering
    /// everything out silently.
    pub fn check_grade(grade: Option<&str>, job: &Job) -> Result<()> {
        if let Some(g) = grade
            && !job.grades.iter().any(|(n, _)| n.eq_ignore_ascii_case(g))
        {
            let known: Vec<&str> = job.grades.iter().map(|(n, _)| n.as_str()).collect();
            return Err(Error::msg(format!(
                "--grade {g}: the job defines no such grade (expected one of [{}]; grades are [materials.NAME] tables)",
                known.join(", ")
            )));
        }
        Ok(())
    }
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
