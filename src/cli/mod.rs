//! Command-line interface: argument definitions (one file per command),
//! turned into typed inputs for the library before any work starts.

mod analyse;
mod batch;
mod catalog;
mod catargs;
mod check;
mod jobargs;
mod optimise;
mod output;
mod progress;
mod report;
mod section;
mod select;
mod sweep;
mod values;

use beamsift::Error;
use beamsift::files;
use beamsift::report::Format;
use beamsift::units::System;
use clap::{Parser, Subcommand};

/// Exit code when everything asked for was done (and a checked section passes).
pub const EXIT_OK: i32 = 0;
/// Exit code when a check or a selection finds no passing section.
pub const EXIT_FAILS: i32 = 1;
/// Exit code for bad input (the message names the file, line, column or field).
pub const EXIT_INPUT: i32 = 2;
/// Exit code when a file could not be read or written.
pub const EXIT_IO: i32 = 3;
/// Exit code for a bug (a panic or a broken invariant).
pub const EXIT_INTERNAL: i32 = 4;
/// Exit code after an interrupting signal (128 + SIGINT, by convention).
pub const EXIT_SIGNAL: i32 = 130;
/// Exit code when a checked section is not verified: nothing evaluated
/// fails, but a limit state that applies could not be evaluated.
pub const EXIT_NOT_VERIFIED: i32 = 5;

#[derive(Parser, Debug)]
#[command(
    name = "beamsift",
    version,
    about = "Find the lightest or cheapest beam section that works, and show the working.",
    long_about = "beamsift analyses a beam once (spans, supports, loads by case and \
combination) and checks sections against bending and shear stress, deflection \
limits and, where asked, lateral-torsional buckling.\n\n\
Every quantity carries its unit: 6m, 12.5kN/m, 250MPa, 8356cm4, 12'-6\".\n\n\
beamsift is an aid for a competent person: verify its results against the \
governing local code and licensed practice.",
    after_help = "Start with the bundled (invented) demo:\n  beamsift select --job catalogs/demo-job.toml --catalog catalogs/demo-steel.csv\n\n\
Exit codes: 0 done / passes, 1 fails or nothing passes, 2 bad input, \
3 file error, 4 internal error, 5 not verified (check, report: a limit state \
that applies could not be evaluated)."
)]
pub struct Cli {
    #[command(flatten)]
    pub out: output::OutputArgs,
    #[command(subcommand)]
    pub command: Command,
}

#[derive(Subcommand, Debug)]
pub enum Command {
    /// Print a cross-section's properties, to check a section before trusting a run.
    #[command(after_help = section::EXAMPLES)]
    Section(section::Args),
    /// Check one section against a job: bending, shear, deflection, stability.
    #[command(after_help = check::EXAMPLES)]
    Check(check::Args),
    /// Analyse a beam: reactions, moment, shear and deflection extremes.
    #[command(after_help = analyse::EXAMPLES)]
    Analyse(analyse::Args),
    /// Scan catalogues and rank the sections that pass (lightest first by default).
    #[command(after_help = select::EXAMPLES)]
    Select(select::Args),
    /// A priced shortlist: the cheapest and the lightest passing sections with quantities.
    #[command(after_help = select::SHORTLIST_EXAMPLES)]
    Shortlist(select::ShortlistArgs),
    /// Size a whole member schedule into a bill of quantities.
    #[command(after_help = batch::EXAMPLES)]
    Batch(batch::Args),
    /// Proportion a rectangle, welded I, mono-symmetric I or hollow section for least area.
    #[command(after_help = optimise::EXAMPLES)]
    Optimise(optimise::Args),
    /// Write a calculation sheet (Markdown and HTML) for one member.
    #[command(after_help = report::EXAMPLES)]
    Report(report::Args),
    /// Span sweeps: the lightest section per span, and span tables.
    #[command(subcommand, after_help = sweep::EXAMPLES)]
    Sweep(sweep::Cmd),
    /// Validate, list or generate catalogue files.
    #[command(subcommand)]
    Catalog(catalog::Cmd),
    /// Print a shell completion script (bash, zsh, fish, elvish, powershell).
    #[command(
        after_help = "Example:\n  beamsift completions bash > ~/.local/share/bash-completion/completions/beamsift"
    )]
    Completions {
        /// The shell.
        #[arg(value_enum)]
        shell: clap_complete::Shell,
    },
}

/// Run and map the outcome to an exit code. A panic is a bug: it is
/// reported as an internal error with exit code 4, never as a result.
pub fn main() -> i32 {
    std::panic::set_hook(Box::new(|info| {
        eprintln!(
            "beamsift: internal error (please report it, with the command and input): {info}"
        );
    }));
    // An interrupted run removes its temporary files and writes nothing.
    let _ = ctrlc::set_handler(|| {
        files::remove_temporaries();
        eprintln!("beamsift: interrupted; no output was written");
        std::process::exit(EXIT_SIGNAL);
    });
    let cli = Cli::parse();
    let outcome = std::panic::catch_unwind(std::panic::AssertUnwindSafe(|| run(cli)));
    let Ok(outcome) = outcome else {
        return EXIT_INTERNAL;
    };
    match outcome {
        Ok(code) => code,
        Err(e) => {
            if let Error::Io { source, .. } = &e
                && source.kind() == std::io::ErrorKind::BrokenPipe
            {
                return EXIT_OK;
            }
            let top = e.to_string();
            eprintln!("beamsift: error: {top}");
            // Causes not already in the message (an I/O error's text is).
            let mut src = std::error::Error::source(&e);
            while let Some(s) = src {
                let t = s.to_string();
                if !top.contains(&t) {
                    eprintln!("  caused by: {t}");
                }
                src = s.source();
            }
            exit_code(&e)
        }
    }
}

/// The exit code of a verdict.
pub fn verdict_code(v: beamsift::check::Verdict) -> i32 {
    match v {
        beamsift::check::Verdict::Passes => 0,
        beamsift::check::Verdict::Fails => EXIT_FAILS,
        beamsift::check::Verdict::NotVerified => EXIT_NOT_VERIFIED,
    }
}

/// The documented exit code of an error.
pub fn exit_code(e: &Error) -> i32 {
    match e {
        Error::Input { .. } | Error::Many(_) => EXIT_INPUT,
        Error::NoSolution(_) => EXIT_FAILS,
        Error::Io { .. } => EXIT_IO,
        Error::Internal(_) => EXIT_INTERNAL,
    }
}

fn run(cli: Cli) -> beamsift::Result<i32> {
    let out = cli.out.resolve()?;
    if out.format.needs_data() && !cli.command.has_data() {
        return Err(Error::msg(
            "--format xlsx and csv-numeric write a result's tables: batch, select, shortlist, sweep lightest and sweep table have them; this command has none (use --format csv, json or markdown)",
        )
        .in_field("--format"));
    }
    let (inputs, outputs) = cli.command.files(&out);
    files::check(&inputs, &outputs, out.force)?;
    if out.path.is_none() && !files::stdout_is_open() {
        return Err(Error::io(
            "standard output",
            std::io::Error::other(
                "is closed: the result would be lost (redirect it, or use -o FILE)",
            ),
        ));
    }
    let result = run_command(cli.command, &out);
    match result {
        Ok(code) => {
            files::commit_queued(out.force)?;
            Ok(code)
        }
        Err(e) => {
            files::discard();
            Err(e)
        }
    }
}

impl Command {
    /// Whether the command's result has data tables (for the spreadsheet
    /// formats).
    fn has_data(&self) -> bool {
        matches!(
            self,
            Command::Batch(_) | Command::Select(_) | Command::Shortlist(_) | Command::Sweep(_)
        )
    }

    /// The files this command reads and the files it writes, from its
    /// parsed arguments.
    fn files(&self, out: &Out) -> (Vec<std::path::PathBuf>, Vec<std::path::PathBuf>) {
        let mut inputs: Vec<std::path::PathBuf> = Vec::new();
        let mut outputs: Vec<std::path::PathBuf> = out.path.iter().cloned().collect();
        let pair = |p: &std::path::Path, outputs: &mut Vec<std::path::PathBuf>| {
            if p.as_os_str().to_string_lossy().ends_with('/') || p.file_name().is_none() {
                // A folder as a prefix: refused by the check, by name.
                outputs.push(p.to_path_buf());
                return;
            }
            let (md, html) = output::sheet_paths(p);
            outputs.push(md);
            outputs.push(html);
        };
        match self {
            Command::Section(_) | Command::Completions { .. } => {}
            Command::Check(a) => {
                inputs.extend(a.job.job.clone());
                inputs.extend(a.cat.catalog.clone());
                if let Some(p) = &a.report {
                    pair(p, &mut outputs);
                }
            }
            Command::Analyse(a) => inputs.extend(a.job.job.clone()),
            Command::Select(a) => {
                inputs.extend(a.job.job.clone());
                inputs.extend(a.cat.catalog.clone());
                if let Some(p) = &a.report {
                    pair(p, &mut outputs);
                }
            }
            Command::Shortlist(a) => {
                inputs.extend(a.job.job.clone());
                inputs.extend(a.cat.catalog.clone());
            }
            Command::Batch(a) => {
                inputs.push(a.schedule.clone());
                inputs.push(a.job.clone());
                inputs.extend(a.cat.catalog.clone());
            }
            Command::Optimise(a) => {
                inputs.extend(a.job.job.clone());
                inputs.extend(a.catalog.clone());
            }
            Command::Report(a) => {
                inputs.extend(a.job.job.clone());
                inputs.extend(a.cat.catalog.clone());
                pair(&a.to, &mut outputs);
            }
            Command::Sweep(sweep::Cmd::Lightest(a)) => {
                inputs.extend(a.job.job.clone());
                inputs.extend(a.cat.catalog.clone());
                outputs.extend(a.chart.clone());
            }
            Command::Sweep(sweep::Cmd::Table(a)) => {
                inputs.extend(a.job.job.clone());
                inputs.extend(a.cat.catalog.clone());
                outputs.extend(a.chart.clone());
            }
            Command::Catalog(catalog::Cmd::Validate(a) | catalog::Cmd::Show(a)) => {
                inputs.push(a.file.clone());
                inputs.extend(a.job.clone());
            }
            Command::Catalog(catalog::Cmd::Generate(_)) => {}
        }
        // A workbook's sheet (FILE#SHEET) is read from FILE.
        let inputs = inputs
            .iter()
            .map(|p| beamsift::catalog::workbook::split_sheet(p).0)
            .collect();
        (inputs, outputs)
    }
}

fn run_command(command: Command, out: &Out) -> beamsift::Result<i32> {
    match command {
        Command::Section(a) => section::run(a, out),
        Command::Check(a) => check::run(a, out),
        Command::Analyse(a) => analyse::run(a, out),
        Command::Select(a) => select::run(a, out),
        Command::Shortlist(a) => select::run_shortlist(a, out),
        Command::Batch(a) => batch::run(a, out),
        Command::Catalog(c) => catalog::run(c, out),
        Command::Optimise(a) => optimise::run(a, out),
        Command::Sweep(c) => sweep::run(c, out),
        Command::Report(a) => report::run(a, out),
        Command::Completions { shell } => {
            use clap::CommandFactory;
            let mut cmd = Cli::command();
            let mut buf = Vec::new();
            clap_complete::generate(shell, &mut cmd, "beamsift", &mut buf);
            output::emit(out, &String::from_utf8_lossy(&buf))?;
            Ok(0)
        }
    }
}

/// Resolved output options.
/// A whole number within LO..=HI (a clap value parser).
pub fn count_in<const LO: usize, const HI: usize>(s: &str) -> std::result::Result<usize, String> {
    let n: usize = s
        .trim()
        .parse()
        .map_err(|_| format!("'{s}' is not a whole number: expected {LO} to {HI}"))?;
    if !(LO..=HI).contains(&n) {
        return Err(format!("{n} is outside {LO} to {HI}"));
    }
    Ok(n)
}

#[derive(Clone, Debug)]
pub struct Out {
    pub units: System,
    pub format: Format,
    pub path: Option<std::path::PathBuf>,
    /// Overwrite existing output files.
    pub force: bool,
    /// How the spreadsheet formats are written.
    pub data: beamsift::report::data::DataOptions,
}

#[cfg(test)]
mod tests {
    use super::*;
    use clap::CommandFactory;

    #[test]
    fn clap_definition_is_consistent() {
        Cli::command().debug_assert();
    }
}
