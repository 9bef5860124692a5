//! Text to tree: the lexer, the parser and its syntax tree, and the canonical layout
//! (`syz fmt`), which works on tokens and comments as written.

pub mod ast;
pub mod layout;
pub mod lexer;
pub mod parser;
