/// \file
/// Splitting SPICE text into cards and cards into tokens, without copying: tokens are views into
/// the file text (a joined copy is made only for a `{...}` or `'...'` group that runs over a `+`
/// continuation). Internal to netlist-io (the SPICE reader), public for its tests.
#pragma once

#include <cstdint>
#include <deque>
#include <string>
#include <string_view>
#include <vector>

namespace gateloop {

/// One card: its first physical line through its last `+` continuation line. Blank lines and
/// `*` / `;` comment lines between a card and its continuations are skipped.
struct SpiceCard {
  std::uint32_t begin = 0;  ///< offset of the first non-blank character of the first line
  std::uint32_t end = 0;    ///< offset just past the content of the last line (before CR/LF)
  std::uint32_t line = 0;   ///< 1-based line of the first line
  std::uint32_t column = 0; ///< 1-based column of `begin`
  /// A `+` line with no card before it in this file (the caller reports it).
  bool orphanContinuation = false;
  /// The card has `+` continuation lines (end lies on a later line than begin).
  bool continued = false;
};

/// Walks the lines of one file's text and yields cards.
class SpiceCardScanner {
public:
  /// Starts at \p offset, which must be the start of line \p line.
  SpiceCardScanner(std::string_view text, std::size_t offset, std::uint32_t line)
      : text_(text), pos_(offset), line_(line) {}

  /// The next card; false at the end of the text.
  bool next(SpiceCard &card);

  /// Skips whole lines until one whose first word equals \p word (case-insensitive, e.g.
  /// ".endc"); that line is consumed too. False when the text ends first.
  bool skipPastLineStartingWith(std::string_view word);

  std::size_t offset() const { return pos_; }
  std::uint32_t line() const { return line_; }

private:
  std::string_view text_;
  std::size_t pos_;
  std::uint32_t line_;
  // The line looked at (and not taken) when checking for continuations; the next call starts
  // there, so it is not searched for its end twice.
  std::size_t peekAt_ = static_cast<std::size_t>(-1);
  std::size_t peekContentEnd_ = 0, peekNext_ = 0;
};

/// A token of a card with the position of its first character.
struct SpiceToken {
  std::string_view text;
  std::uint32_t line = 0;
  std::uint32_t column = 0;
};

/// Why a card could not be split.
struct SpiceTokenError {
  std::string message;
  std::uint32_t line = 0;
  std::uint32_t column = 0;
};

/// Splits \p card of \p text into tokens. Separators: blanks, tabs, CR and commas; `=` is a token
/// of its own; `{...}` (nested), `'...'` and `"..."` groups stay inside one token even with
/// blanks; `;` and a `$` that starts a word and is followed by a blank begin a comment that runs to
/// the end of that physical line; a continuation line's leading `+` is dropped. Joined copies of
/// groups that span continuation lines live in \p arena. Returns false (and sets \p error) for an
/// unterminated group.
bool tokenizeSpiceCard(std::string_view text, const SpiceCard &card, std::vector<SpiceToken> &out,
                       std::deque<std::string> &arena, SpiceTokenError &error);

/// A word of a card after `=` grouping: either a plain token or `name=value`.
struct SpiceWord {
  SpiceToken key;   ///< the token, or the name of a pair
  SpiceToken value; ///< the value of a pair (empty text otherwise)
  bool pair = false;
};

/// Groups tokens [first, end) into words: `a = b`, `a=b` become pairs; a `params:` keyword (alone
/// or glued to a name, any case) is dropped. Returns false (and sets \p error) for a `=` with no
/// name before it or no value after it.
bool groupSpiceWords(const std::vector<SpiceToken> &tokens, std::size_t first,
                     std::vector<SpiceWord> &out, SpiceTokenError &error);

} // namespace gateloop
