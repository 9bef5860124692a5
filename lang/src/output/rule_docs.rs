//! The long explanation of each rule, cut at build time from `docs/rules.md` (embedded with
//! `include_str!`, so there is one text to maintain and no file is read at run time). Used
//! for SARIF rule help and available to the language server.

use crate::diagnostic::Rule;

const RULES_MD: &str = include_str!("../../../docs/rules.md");

/// The section of docs/rules.md about `rule`, without its `## id` heading and the
/// "Default severity" line, trimmed. `None` if the page has no such section.
pub fn help_markdown(rule: Rule) -> Option<&'static str> {
    let heading = format!("\n## {}\n", rule.id());
    let start = RULES_MD.find(&heading)? + heading.len();
    let rest = RULES_MD.get(start..)?;
    let end = rest.find("\n## ").unwrap_or(rest.len());
    let section = rest.get(..end)?.trim();
    let body = match section.strip_prefix("Default severity:") {
        Some(after) => after.split_once('\n').map_or("", |(_, b)| b).trim(),
        None => section,
    };
    Some(body)
}

/// The first paragraph of the section, with line breaks joined: plain text for people.
pub fn help_text(rule: Rule) -> Option<String> {
    let md = help_markdown(rule)?;
    let para = md.split("\n\n").next()?;
    Some(para.split_whitespace().collect::<Vec<_>>().join(" "))
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn every_rule_has_a_section() {
        for r in Rule::ALL {
            let md = help_markdown(*r).unwrap_or_else(|| panic!("no section for {}", r.id()));
            assert!(!md.is_empty(), "{}", r.id());
            assert!(
                !md.contains("\n## "),
                "{} runs into the next section",
                r.id()
            );
            assert!(!md.starts_with("Default severity"), "{}", r.id());
        }
    }

    #[test]
    fn sections_are_the_right_ones() {
        let t = help_text(Rule::Syntax).unwrap();
        assert!(t.starts_with("The text does not follow the grammar"), "{t}");
        assert!(!t.contains('\n'));
        let io = help_markdown(Rule::Io).unwrap();
        assert!(io.starts_with("A file could not be read."), "{io}");
        assert!(!io.contains("unit-mismatch"), "{io}");
    }
}
