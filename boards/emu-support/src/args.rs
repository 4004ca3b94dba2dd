//! Splitting a command line into options, without allocation.
//!
//! The line is words separated by ASCII whitespace: the program name, then `--name value`
//! pairs and bare `--flag` words. No quoting (QEMU's semihosting `arg=` values cannot carry
//! spaces through its join anyway).

/// The words after the program name.
pub fn words(cmdline: &str) -> impl Iterator<Item = &str> {
    cmdline.split_ascii_whitespace().skip(1)
}

/// One parsed option: `--name value` (value `None` for a bare flag or a missing value).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct Opt<'a> {
    /// The name without its leading `--`.
    pub name: &'a str,
    /// The word after the name, unless that word is itself an option.
    pub value: Option<&'a str>,
}

/// An item of the command line: an option, or a word that is not one (reported so the caller
/// can refuse it rather than ignore it).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum Item<'a> {
    /// `--name [value]`.
    Opt(Opt<'a>),
    /// A word that does not start with `--` and is not an option's value.
    Stray(&'a str),
}

/// Iterator over the [`Item`]s of a command line (after the program name).
#[derive(Debug, Clone)]
pub struct Options<'a> {
    words: core::iter::Peekable<core::iter::Skip<core::str::SplitAsciiWhitespace<'a>>>,
}

/// Parses `cmdline` (program name first) into options.
pub fn options(cmdline: &str) -> Options<'_> {
    Options {
        words: cmdline.split_ascii_whitespace().skip(1).peekable(),
    }
}

/// Whether `word` is an option name: `--` then a letter (so `-12` or `--` alone are not).
fn is_option(word: &str) -> bool {
    word.strip_prefix("--")
        .and_then(|rest| rest.chars().next())
        .is_some_and(|c| c.is_ascii_alphabetic())
}

impl<'a> Iterator for Options<'a> {
    type Item = Item<'a>;

    fn next(&mut self) -> Option<Item<'a>> {
        let word = self.words.next()?;
        match word.strip_prefix("--") {
            Some(name) if is_option(word) => {
                let value = match self.words.peek() {
                    Some(next) if !is_option(next) => self.words.next(),
                    _ => None,
                };
                Some(Item::Opt(Opt { name, value }))
            }
            _ => Some(Item::Stray(word)),
        }
    }
}
