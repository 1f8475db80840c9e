//! Where in the job file a value is: byte spans to file:line:column.

use crate::error::{Error, Location, Result};
use crate::units::{self, Dim};
use toml::Spanned;

/// Maps byte offsets to line:column for error messages.
pub struct Source<'a> {
    pub file: &'a str,
    pub text: &'a str,
}

impl Source<'_> {
    pub fn loc(&self, span: std::ops::Range<usize>, field: &str) -> Location {
        let upto = &self.text[..span.start.min(self.text.len())];
        let line = upto.matches('\n').count() as u64 + 1;
        let col = upto
            .rsplit('\n')
            .next()
            .map(|l| l.chars().count())
            .unwrap_or(0) as u64
            + 1;
        Location::in_file(self.file)
            .with_line(line)
            .with_column(col)
            .with_field(field)
    }
    /// The line of a table's header (`[material]`, `[materials.T1]`,
    /// `[materials."T 1"]`), for problems of a key the table lacks.
    pub fn table_loc(&self, table: &str, field: &str) -> Location {
        let (head, name) = table.split_once('.').unwrap_or((table, ""));
        let unquote = |t: &str| -> String {
            let t = t.trim();
            t.strip_prefix('"')
                .and_then(|r| r.strip_suffix('"'))
                .or_else(|| t.strip_prefix('\'').and_then(|r| r.strip_suffix('\'')))
                .unwrap_or(t)
                .to_string()
        };
        let line = self.text.lines().position(|l| {
            let Some(inner) = l
                .trim()
                .strip_prefix('[')
                .and_then(|r| r.split(']').next())
                .filter(|_| !l.trim().starts_with("[["))
            else {
                return false;
            };
            match inner.split_once('.') {
                None => name.is_empty() && inner.trim() == head,
                Some((h, n)) => h.trim() == head && !name.is_empty() && unquote(n) == name,
            }
        });
        let loc = Location::in_file(self.file).with_field(field);
        match line {
            Some(k) => loc.with_line(k as u64 + 1),
            None => loc,
        }
    }
    pub fn err<T>(
        &self,
        span: std::ops::Range<usize>,
        field: &str,
        msg: impl Into<String>,
    ) -> Result<T> {
        Err(Error::input(self.loc(span, field), msg))
    }
    pub fn q(&self, v: &Spanned<String>, dim: Dim, field: &str) -> Result<f64> {
        units::parse(v.get_ref(), dim).map_err(|e| e.at(&self.loc(v.span(), field)))
    }
}
