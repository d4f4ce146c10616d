//! The `lodestone` command: parse → typed options → library call → writer.

#![allow(
    clippy::neg_cmp_op_on_partial_ord,
    reason = "`!(x > a)` is written on purpose: it is true for NaN, so a NaN argument is refused with the out-of-range values"
)]

mod cli;

fn main() {
    std::process::exit(cli::run());
}
