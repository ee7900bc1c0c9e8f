//! The `ironwind` binary: all the work is in the library.
fn main() {
    std::process::exit(ironwind::cli::main());
}
