//! The `beamsift` binary: parse arguments, run one command, print errors
//! once, exit with a documented code.
//!
//! Exit codes: 0 done (and, for checks, every section passes); 1 the
//! checked section fails or nothing in the catalogue passes; 2 bad input;
//! 3 a file could not be read or written; 4 internal error. A closed
//! output pipe ends quietly with 0.

#![forbid(unsafe_code)]

mod cli;

fn main() {
    std::process::exit(cli::main());
}
