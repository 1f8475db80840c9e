//! What prices the catalogues of a run carry, said once for every output
//! that shows a cost: a column header names the currency or says "no
//! prices", and JSON says `"prices": "none"` rather than inventing a
//! currency.

use super::schema::{PriceBasis, Schema};
use crate::error::{Error, Result};
use serde::Serialize;

/// The prices of a run's catalogues.
#[derive(Clone, Debug, PartialEq, Serialize)]
pub struct Prices {
    /// `none` (no price column, or every price cell empty), `given` (every
    /// row read has a price) or `partly given` (some rows have none).
    pub prices: &'static str,
    /// The currency named by the job or the first priced catalogue's
    /// header; null without prices or when no header names one.
    pub currency: Option<String>,
    /// What the price columns are per (length, mass, volume), each once.
    pub price_basis: Vec<PriceBasis>,
}

impl Prices {
    /// From the catalogues' headers and the job's currency (which wins).
    /// `rows` is (rows read, rows with a price) when the rows are known
    /// (schedules), none when they are not (scans).
    pub fn of(
        job_currency: Option<&str>,
        schemas: &[&Schema],
        rows: Option<(usize, usize)>,
    ) -> Prices {
        let mut price_basis = Vec::new();
        for b in schemas.iter().filter_map(|s| s.price_basis) {
            if !price_basis.contains(&b) {
                price_basis.push(b);
            }
        }
        let prices = match rows {
            _ if price_basis.is_empty() => "none",
            Some((_, 0)) => "none",
            Some((n, p)) if p < n => "partly given",
            _ => "given",
        };
        if prices == "none" {
            return Prices {
                prices,
                currency: None,
                price_basis: Vec::new(),
            };
        }
        let currency = job_currency
            .map(str::to_string)
            .or_else(|| schemas.iter().find_map(|s| s.currency.clone()));
        Prices {
            prices,
            currency,
            price_basis,
        }
    }

    /// The prices once the rows are read: `rows` read, `priced` of them
    /// with a price.
    pub fn with_rows(self, rows: usize, priced: usize) -> Prices {
        if priced == 0 {
            Prices::none()
        } else if priced < rows {
            Prices {
                prices: "partly given",
                ..self
            }
        } else {
            self
        }
    }

    /// No prices at all.
    pub fn none() -> Prices {
        Prices {
            prices: "none",
            currency: None,
            price_basis: Vec::new(),
        }
    }

    /// Whether any row has a price.
    pub fn any(&self) -> bool {
        self.prices != "none"
    }

    /// The unit a cost column shows: the currency, "currency not named",
    /// or "no prices".
    pub fn label(&self) -> String {
        match (&self.currency, self.any()) {
            (_, false) => "no prices".into(),
            (Some(c), true) => c.clone(),
            (None, true) => "currency not named".into(),
        }
    }

    /// The unit of a cost per `per` (a length unit): `EUR/m`, or "no
    /// prices".
    pub fn per(&self, per: &str) -> String {
        if self.any() {
            format!("{}/{per}", self.label())
        } else {
            self.label()
        }
    }

    /// What a cost cell shows when it has no figure: "no prices" when the
    /// run has none, "—" when only this row lacks one.
    pub fn missing(&self) -> &'static str {
        if self.any() { "—" } else { "no prices" }
    }

    /// A sentence on the prices for the document, when they need one.
    pub fn note(&self) -> Option<String> {
        if !self.any() {
            return Some("No prices: the catalogue has no price column (or every price cell is empty), so no cost is given.".into());
        }
        let conv: Vec<&str> = self
            .price_basis
            .iter()
            .filter(|b| **b != PriceBasis::PerLength)
            .map(|b| b.phrase())
            .collect();
        let mut s = String::new();
        if !conv.is_empty() {
            s.push_str(&format!(
                "Prices are {}; costs per length are what the rankings use.",
                conv.join("; ")
            ));
        }
        if self.prices == "partly given" {
            if !s.is_empty() {
                s.push(' ');
            }
            s.push_str("Some rows have no price: by cost they rank after every priced row, and a total that includes one is not given.");
        }
        (!s.is_empty()).then_some(s)
    }

    /// Refuse an option `what` that needs prices when there are none.
    pub fn require(&self, what: &str, instead: &str) -> Result<()> {
        if self.any() {
            return Ok(());
        }
        Err(Error::msg(format!(
            "{what}: the catalogue has no prices (no cost or price column, or every price cell empty): add a price column, e.g. cost [EUR/m], price [EUR/t] or price [EUR/m3], or {instead}"
        )))
    }
}
