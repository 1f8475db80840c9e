//! Sweeps as serialised — the lightest section by span and the span table —
//! their charts and their documents (the sweeps run in `sweep` and
//! `search::spans`).

use super::select::{Legend, finish_doc};
use super::{Align, CAUTION, Document, Table, chart, member};
use crate::catalog::Materials;
use crate::check::{CheckKind, Prepared};
use crate::error::Result;
use crate::job::Job;
use crate::search::{self, Candidate, spans::SpanBest};
use crate::sweep::{Cell, Column, Method, SpanOptimum};
use crate::units::{Show, System};
use serde::Serialize;

/// The lightest section at one span, as printed and serialised.
#[derive(Serialize)]
pub struct LightestOut {
    /// mm.
    pub span: f64,
    pub section: Option<String>,
    /// kg/m.
    pub mass: Option<f64>,
    pub utilisation: Option<f64>,
    pub governing: Option<CheckKind>,
    /// Lighter rows not verified at this span (never taken as passing).
    pub lighter_not_verified: u64,
    pub not_verified_reasons: Vec<String>,
    /// Parametric optimum at this span (area mm², description).
    pub optimum: Option<SpanOptimum>,
}

/// What every sweep result carries besides its rows.
#[derive(Serialize)]
pub struct Context {
    pub title: String,
    pub excluded: Vec<String>,
    pub assumptions: Vec<String>,
    pub notes: Vec<String>,
    /// Where the chart is written.
    pub chart: Option<String>,
    pub caution: &'static str,
    /// What is not checked, for the sections met (the legend of the
    /// caution).
    #[serde(skip)]
    pub not_checked: Vec<String>,
}

/// The lightest section by span.
#[derive(Serialize)]
pub struct LightestResult {
    #[serde(flatten)]
    pub context: Context,
    pub rows: Vec<LightestOut>,
}

/// The span table: the longest span of each section in each column.
#[derive(Serialize)]
pub struct TableRow {
    pub section: String,
    /// kg/m.
    pub mass: f64,
    pub cells: Vec<Cell>,
}

#[derive(Serialize)]
pub struct TableResult {
    #[serde(flatten)]
    pub context: Context,
    /// Column labels.
    pub columns: Vec<String>,
    pub rows: Vec<TableRow>,
    pub rounded_to: Option<f64>,
}

/// The job's title, exclusions, assumptions and notes, and what is not
/// checked for `rows` (each item once, in the order met).
fn context(
    job: &Job,
    rows: &[Candidate],
    mats: &Materials<'_>,
    chart: Option<String>,
    sys: System,
) -> Result<Context> {
    let prep = Prepared::new(&job.beam, job.material.clone(), job.criteria.clone())?;
    let mut not_checked: Vec<String> = Vec::new();
    for r in rows {
        for s in prep.not_checked(&r.properties, Some(mats.get(&r.material))) {
            if !not_checked.contains(&s) {
                not_checked.push(s);
            }
        }
    }
    Ok(Context {
        title: job.title.clone(),
        excluded: prep.criteria.exclude.list(),
        assumptions: prep.assumptions_in(sys),
        notes: job.notes.clone(),
        chart,
        caution: CAUTION,
        not_checked,
    })
}

impl LightestResult {
    /// The lightest section found at each of `spans` (and the parametric
    /// optimum there, when one was sought); `samples` are the sections
    /// whose kinds were met (for what is not checked).
    #[allow(clippy::too_many_arguments)]
    pub fn new(
        job: &Job,
        spans: &[f64],
        found: &[SpanBest],
        optima: Vec<Option<SpanOptimum>>,
        samples: &[Candidate],
        mats: &Materials<'_>,
        chart: Option<String>,
        sys: System,
    ) -> Result<LightestResult> {
        let rows = found
            .iter()
            .zip(optima)
            .zip(spans)
            .map(|((f, o), &span)| LightestOut {
                span,
                section: f.best.as_ref().map(|b| b.name.clone()),
                mass: f.best.as_ref().map(|b| b.mass),
                utilisation: f.utilisation,
                governing: f.governing,
                lighter_not_verified: f.lighter_not_verified,
                not_verified_reasons: f.not_verified_reasons.clone(),
                optimum: o,
            })
            .collect();
        Ok(LightestResult {
            context: context(job, samples, mats, chart, sys)?,
            rows,
        })
    }
}

/// A spacing as the trade writes it: mm in SI; in US units inches below
/// 3 ft (joists at 16 in) and feet from 3 ft when the spacing is a whole
/// number of feet (beams at 6 ft), inches otherwise.
fn spacing(w: f64, sys: System) -> String {
    if sys.is_us() {
        let inches = w / 25.4;
        let feet = inches / 12.0;
        if inches >= 36.0 - 1e-9 && (feet - feet.round()).abs() < 1e-6 {
            return Show::Span.fmt(w, sys);
        }
    }
    Show::Dimension.fmt(w, sys)
}

/// The label of a span-table column.
pub fn column_label(c: Column, sys: System) -> String {
    match c {
        Column::AsGiven => "as in the job".into(),
        Column::Spacing(w) => format!("{} centres", spacing(w, sys)),
        Column::LivePressure(p) => format!("live {}", Show::AreaLoad.fmt(p, sys)),
    }
}

impl TableResult {
    /// The span table of `rows` (one line of `cells` per row, one cell per
    /// column).
    #[allow(clippy::too_many_arguments)]
    pub fn new(
        job: &Job,
        columns: &[Column],
        rows: &[Candidate],
        cells: Vec<Vec<Cell>>,
        rounded_to: Option<f64>,
        mats: &Materials<'_>,
        chart: Option<String>,
        sys: System,
    ) -> Result<TableResult> {
        Ok(TableResult {
            context: context(job, rows, mats, chart, sys)?,
            columns: columns.iter().map(|&c| column_label(c, sys)).collect(),
            rows: rows
                .iter()
                .zip(cells)
                .map(|(r, c)| TableRow {
                    section: r.name.clone(),
                    mass: r.mass,
                    cells: c,
                })
                .collect(),
            rounded_to,
        })
    }
}

/// How a sweep is shown.
pub struct SweepView<'a> {
    pub sys: System,
    pub job: &'a Job,
    /// The rows read (for the line that counts them).
    pub counts: &'a search::Counts,
    pub skip_bad_rows: bool,
}

/// The line that counts the sections read.
fn rows_read_line(c: &search::Counts, skip_bad_rows: bool) -> String {
    let mut line = format!("{} section(s) read", c.rows);
    if c.filtered > 0 {
        line.push_str(&format!(", {} left out by the filters", c.filtered));
    }
    if c.bad > 0 || skip_bad_rows {
        line.push_str(&format!(", {} bad row(s) skipped", c.bad));
    }
    line.push('.');
    if let Some(n) = super::select::flagged_note(c) {
        line.push(' ');
        line.push_str(&n);
    }
    line
}

/// A sweep's document up to its table: the job and the rows read.
fn start(title: String, v: &SweepView<'_>) -> Document {
    let mut doc = Document::new(title);
    for t in member::job_tables(v.job, v.sys) {
        doc.table(t);
    }
    doc.para(rows_read_line(v.counts, v.skip_bad_rows));
    doc
}

/// The end of a sweep's document: exclusions, assumptions, notes and what
/// is not checked (as a legend), then the caution.
fn finish(doc: &mut Document, c: &Context) {
    let mut legend = Legend::default();
    legend.keys(&c.not_checked);
    finish_doc(doc, &c.excluded, &c.assumptions, &c.notes, legend);
}

/// Table headers with their alignment.
fn table(headers: &[(String, Align)]) -> Table {
    let refs: Vec<(&str, Align)> = headers.iter().map(|(h, a)| (h.as_str(), *a)).collect();
    Table::new("", &refs)
}

/// The chart of the lightest section by span (SVG).
pub fn lightest_chart(r: &LightestResult, sys: System) -> String {
    let pts: Vec<(f64, Option<f64>, String)> = r
        .rows
        .iter()
        .map(|r| {
            (
                Show::Span.value(r.span, sys),
                r.mass.map(|m| Show::Mass.value(m, sys)),
                r.section.clone().unwrap_or_default(),
            )
        })
        .collect();
    chart::lightest_chart(
        &format!("Lightest passing section — {}", r.context.title),
        &format!("Span [{}]", Show::Span.label(sys)),
        &format!("Mass per length [{}]", Show::Mass.label(sys)),
        &pts,
    )
}

/// The document of the lightest section by span (`optimised`: the
/// parametric optimum was sought at each span).
pub fn lightest_document(r: &LightestResult, optimised: bool, v: &SweepView<'_>) -> Document {
    let sys = v.sys;
    let mut doc = start(format!("Lightest section by span — {}", r.context.title), v);
    let mut hs = vec![
        (format!("Span [{}]", Show::Span.label(sys)), Align::Right),
        ("Lightest passing".to_string(), Align::Left),
        (format!("Mass [{}]", Show::Mass.label(sys)), Align::Right),
        ("Utilisation".to_string(), Align::Right),
        ("Governed by".to_string(), Align::Left),
        ("Lighter, not verified".to_string(), Align::Right),
    ];
    if optimised {
        hs.push((
            format!("Optimum area [{}]", Show::Area.label(sys)),
            Align::Right,
        ));
        hs.push(("Optimum".to_string(), Align::Left));
    }
    let mut t = table(&hs);
    for r in &r.rows {
        let mut row = vec![
            Show::Span.fixed_down(r.span, sys, 2),
            r.section.clone().unwrap_or_else(|| "none passes".into()),
            r.mass
                .map(|m| Show::Mass.fixed(m, sys, 1))
                .unwrap_or_else(|| "—".into()),
            r.utilisation
                .map(|u| format!("{u:.3}"))
                .unwrap_or_else(|| "—".into()),
            r.governing
                .map(|g| g.short().to_string())
                .unwrap_or_default(),
            r.lighter_not_verified.to_string(),
        ];
        if optimised {
            row.push(
                r.optimum
                    .as_ref()
                    .map(|o| Show::Area.num(o.0, sys))
                    .unwrap_or_else(|| "—".into()),
            );
            row.push(r.optimum.as_ref().map(|o| o.1.clone()).unwrap_or_default());
        }
        t.row(row);
    }
    doc.table(t);
    if let Some(p) = &r.context.chart {
        doc.para(format!("Chart written to {p}."));
    }
    doc.para("Each span scales the job's geometry (spans and load positions) so the longest span equals it; load intensities are as given.");
    if let Some(r) = r.rows.iter().find(|r| r.lighter_not_verified > 0) {
        doc.list(
            "Lighter sections that are not verified were skipped (a limit state that applies could not be evaluated), for example:",
            r.not_verified_reasons.clone(),
        );
    }
    finish(&mut doc, &r.context);
    doc
}

/// The symbol of what governs just beyond a span-table cell.
fn symbol(kind: Option<CheckKind>) -> &'static str {
    use CheckKind::*;
    match kind {
        Some(
            BendingSaggingTop | BendingSaggingBottom | BendingHoggingTop | BendingHoggingBottom,
        ) => "M",
        Some(Shear | WebShear) => "V",
        Some(Yielding | TensionFlangeYielding) => "M",
        Some(FlangeLocalBuckling | WebLocalBuckling) => "LB",
        Some(LateralTorsional) => "LTB",
        Some(Deflection) => "δ",
        None => "",
    }
}

/// The chart of a span table (SVG).
pub fn table_chart(r: &TableResult, sys: System) -> String {
    let names: Vec<String> = r.rows.iter().map(|r| r.section.clone()).collect();
    let spans: Vec<Vec<Option<f64>>> = (0..r.columns.len())
        .map(|c| {
            r.rows
                .iter()
                .map(|r| r.cells[c].span.map(|s| Show::Span.value(s, sys)))
                .collect()
        })
        .collect();
    chart::span_chart(
        &format!("Maximum span — {}", r.context.title),
        &format!("Maximum span [{}]", Show::Span.label(sys)),
        &names,
        &r.columns,
        &spans,
    )
}

/// How the spans of a table were searched.
pub struct Search {
    /// Bisection tolerance, mm.
    pub tolerance: f64,
    /// The tolerance was given (not the default).
    pub tolerance_given: bool,
    /// The longest span searched, mm.
    pub max_span: f64,
}

/// The document of a span table.
pub fn table_document(r: &TableResult, search: &Search, v: &SweepView<'_>) -> Document {
    let sys = v.sys;
    let mut doc = start(format!("Span table — {}", r.context.title), v);
    let mut hs: Vec<(String, Align)> = vec![
        ("Section".into(), Align::Left),
        (format!("Mass [{}]", Show::Mass.label(sys)), Align::Right),
    ];
    for l in &r.columns {
        hs.push((format!("{l} [{}]", Show::Span.label(sys)), Align::Right));
    }
    let mut t = table(&hs);
    for r in &r.rows {
        let mut row = vec![r.section.clone(), Show::Mass.fixed(r.mass, sys, 1)];
        for c in &r.cells {
            row.push(match c.span {
                Some(s) if c.at_search_limit => {
                    format!("≥ {}", Show::Span.fixed_down(s, sys, 2))
                }
                Some(s) if !c.not_verified_beyond.is_empty() => {
                    format!("{} nv", Show::Span.fixed_down(s, sys, 2))
                }
                Some(s) => format!(
                    "{} {}",
                    Show::Span.fixed_down(s, sys, 2),
                    symbol(c.governing)
                ),
                None if !c.not_verified.is_empty() => "not verified".into(),
                None => "—".into(),
            });
        }
        t.row(row);
    }
    doc.table(t);
    if let Some(r) = r
        .rows
        .iter()
        .find(|r| r.cells.iter().any(|c| !c.not_verified.is_empty()))
    {
        let c = r.cells.iter().find(|c| !c.not_verified.is_empty());
        doc.list(
            format!(
                "\"not verified\": a limit state that applies cannot be evaluated, e.g. for {}:",
                r.section
            ),
            c.map(|c| c.not_verified.clone()).unwrap_or_default(),
        );
    }
    if let Some((r, c)) = r.rows.iter().find_map(|r| {
        r.cells
            .iter()
            .find(|c| !c.not_verified_beyond.is_empty())
            .map(|c| (r, c))
    }) {
        doc.list(
            format!(
                "\"nv\": the section passes up to that span and is not verified just beyond it (a method's range ends there), e.g. for {}:",
                r.section
            ),
            c.not_verified_beyond.clone(),
        );
    }
    if r.rows
        .iter()
        .any(|r| r.cells.iter().any(|c| c.at_search_limit))
    {
        doc.para(format!(
            "\"≥\": the section still passes at {}, the longest span searched; its limit is longer (not searched).",
            Show::Span.fmt(search.max_span, sys)
        ));
    }
    let methods: Vec<Method> = r
        .rows
        .iter()
        .flat_map(|r| r.cells.iter().map(|c| c.method))
        .collect();
    doc.para(format!(
        "Each cell: the longest span that passes every check, and what governs just beyond it (M bending, V shear, δ deflection, LTB lateral-torsional buckling). {}{}",
        if methods.contains(&Method::ClosedForm) {
            "Found in closed form (uniform loads: utilisation ∝ L² for bending, L for shear, L³ for deflection/limit, self-weight included). "
        } else {
            ""
        },
        if methods.contains(&Method::Bisection) {
            format!("Found by bisection to {}. ", Show::Dimension.fmt(search.tolerance, sys))
        } else {
            String::new()
        }
    ));
    if search.tolerance_given && !methods.contains(&Method::Bisection) {
        doc.para("--tolerance was not used: every cell was found in closed form, exactly.");
    }
    if let Some(step) = r.rounded_to {
        doc.para(format!(
            "Spans are rounded down to a multiple of {}.",
            Show::Dimension.fmt(step, sys)
        ));
    }
    if let Some(p) = &r.context.chart {
        doc.para(format!("Chart written to {p}."));
    }
    finish(&mut doc, &r.context);
    doc
}

/// What a span-table cell says besides its span, in words (the data
/// tables' status column; the document uses the marks ≥ and nv).
fn cell_status(c: &Cell) -> &'static str {
    match c.span {
        Some(_) if c.at_search_limit => "passes at the longest span searched (limit longer)",
        Some(_) if !c.not_verified_beyond.is_empty() => "passes; not verified just beyond",
        Some(_) => "passes",
        None if !c.not_verified.is_empty() => "not verified",
        None => "fails at the shortest span tried",
    }
}

/// The data table of a span table: per column the longest span (rounded
/// as the document's, when --round was given; unrounded otherwise), what
/// governs just beyond it and the cell's status, each in its own column.
pub fn table_data(r: &TableResult, doc: &Document, sys: System) -> super::data::DataSet {
    // Spreadsheet cells are numbers: lengths as decimals.
    let sys = sys.decimal();
    use super::data::{DataSet, DataTable, Value};
    let mut headers = vec![
        "Section".to_string(),
        format!("Mass [{}]", Show::Mass.label(sys)),
    ];
    for l in &r.columns {
        headers.push(format!("{l}: span [{}]", Show::Span.label(sys)));
        headers.push(format!("{l}: governed by"));
        headers.push(format!("{l}: status"));
    }
    let mut t = DataTable::new(
        "spans",
        "The longest span that passes every check, per section and column",
        headers,
    );
    for row in &r.rows {
        let mut cells = vec![
            Value::text(row.section.clone()),
            Value::Num(Show::Mass.value(row.mass, sys)),
        ];
        for c in &row.cells {
            cells.push(Value::opt(c.span.map(|s| Show::Span.value(s, sys))));
            cells.push(Value::text(
                c.governing
                    .map(|g| g.short().to_string())
                    .unwrap_or_default(),
            ));
            cells.push(Value::text(cell_status(c)));
        }
        t.row(cells);
    }
    DataSet::new(doc, vec![t])
}

/// The data table of the lightest section by span.
pub fn lightest_data(
    r: &LightestResult,
    optimised: bool,
    doc: &Document,
    sys: System,
) -> super::data::DataSet {
    use super::data::{DataSet, DataTable, Value};
    let sys = sys.decimal();
    let mut headers = vec![
        format!("Span [{}]", Show::Span.label(sys)),
        "Lightest passing".to_string(),
        format!("Mass [{}]", Show::Mass.label(sys)),
        "Utilisation".into(),
        "Governed by".into(),
        "Lighter, not verified".into(),
    ];
    if optimised {
        headers.push(format!("Optimum area [{}]", Show::Area.label(sys)));
        headers.push("Optimum".into());
    }
    let mut t = DataTable::new("lightest", "Lightest passing section by span", headers);
    for row in &r.rows {
        let mut cells = vec![
            Value::Num(Show::Span.value(row.span, sys)),
            Value::text(row.section.clone().unwrap_or_else(|| "none passes".into())),
            Value::opt(row.mass.map(|m| Show::Mass.value(m, sys))),
            Value::opt(row.utilisation),
            Value::text(
                row.governing
                    .map(|g| g.short().to_string())
                    .unwrap_or_default(),
            ),
            Value::Num(row.lighter_not_verified as f64),
        ];
        if optimised {
            cells.push(Value::opt(
                row.optimum.as_ref().map(|o| Show::Area.value(o.0, sys)),
            ));
            cells.push(Value::text(
                row.optimum
                    .as_ref()
                    .map(|o| o.1.clone())
                    .unwrap_or_default(),
            ));
        }
        t.row(cells);
    }
    DataSet::new(doc, vec![t])
}
