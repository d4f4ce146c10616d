//! The `lodestone` command: parse → typed options → library call → writer.

mod cli;

fn main() {
    std::process::exit(cli::run());
}
