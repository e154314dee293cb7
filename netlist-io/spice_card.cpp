/// \file
/// Card scanning and tokenising. This is the hot path of the reader on big flat decks, so lines
/// are found with memchr and tokens are views; nothing here allocates per token.
#include "netlist-io/spice_card.h"

#include "checker/core/text_util.h"

#include <cstring>

namespace gateloop {
namespace {

bool isBlank(char c) { return c == ' ' || c == '\t' || c == '\r' || c == '\f' || c == '\v'; }
bool isSeparator(char c) { return isBlank(c) || c == ','; }

/// Characters that end a plain run inside a token: separators, `=`, `;` and group openers. A
/// table lookup per byte keeps the inner loop to one branch.
struct StopTable {
  bool stop[256] = {};
  constexpr StopTable() {
    for (unsigned char c : {' ', '\t', '\r', '\f', '\v', ',', '=', ';', '{', '\'', '"'}) stop[c] = true;
  }
};
constexpr StopTable kStops;


/// One physical line: [begin, contentEnd) without CR/LF; next = start of the following line.
struct Line {
  std::size_t begin, contentEnd, next;
};

Line lineAt(std::string_view text, std::size_t pos) {
  const char *base = text.data();
  const void *nl = std::memchr(base + pos, '\n', text.size() - pos);
  std::size_t end = nl ? static_cast<std::size_t>(static_cast<const char *>(nl) - base) : text.size();
  std::size_t next = nl ? end + 1 : end;
  std::size_t contentEnd = end;
  while (contentEnd > pos && (text[contentEnd - 1] == '\r')) --contentEnd;
  return {pos, contentEnd, next};
}

std::size_t firstNonBlank(std::string_view text, std::size_t from, std::size_t to) {
  while (from < to && isBlank(text[from])) ++from;
  return from;
}

bool isCommentStart(char c) { return c == '*' || c == ';'; }

/// A piece of the buffer being tokenised that comes from one physical line.
struct Segment {
  std::size_t begin, end; ///< range in the buffer
  std::uint32_t line;
  std::uint32_t columnOfBegin; ///< 1-based column of buffer[begin] in the file
};

enum class TokenizeStatus { Ok, Unterminated, NeedsJoin };

char closerOf(char c) { return c == '{' ? '}' : c; }

/// Tokenises \p buf. When \p joined is false every segment is tokenised on its own and a group
/// that is still open at a segment end (with more segments to come) asks for a joined retry.
TokenizeStatus tokenizeSegments(std::string_view buf, const Segment *segs, std::size_t segCount,
                                bool joined, std::vector<SpiceToken> &out, SpiceTokenError &error) {
  std::size_t bufEnd = segCount ? segs[segCount - 1].end : 0;
  std::size_t s = 0;
  std::size_t i = segCount ? segs[0].begin : 0;
  auto column = [&](std::size_t at, std::size_t seg) {
    return static_cast<std::uint32_t>(at - segs[seg].begin + segs[seg].columnOfBegin);
  };
  while (s < segCount) {
    std::size_t segEnd = joined ? bufEnd : segs[s].end;
    // In joined mode comments still end at their own physical line.
    std::size_t lineEnd = segs[s].end;
    if (i < segs[s].begin) i = segs[s].begin;
    if (i >= lineEnd) {
      ++s;
      continue;
    }
    char c = buf[i];
    if (isSeparator(c)) {
      ++i;
      continue;
    }
    if (c == ';' || (c == '$' && (i + 1 >= lineEnd || isBlank(buf[i + 1])))) {
      i = lineEnd; // comment to end of this physical line
      continue;
    }
    if (c == '=') {
      out.push_back({buf.substr(i, 1), segs[s].line, column(i, s)});
      ++i;
      continue;
    }
    std::size_t start = i;
    std::size_t startSeg = s;
    while (i < segEnd) {
      while (i < segEnd && !kStops.stop[static_cast<unsigned char>(buf[i])]) ++i;
      if (i >= segEnd) break;
      c = buf[i];
      if (isSeparator(c) || c == '=' || c == ';') break;
      if (c == '{' || c == '\'' || c == '"') {
        char open = c, close = closerOf(c);
        int nest = 0;
        // A brace group counts its own '{'; a quote starts looking after itself.
        std::size_t j = open == '{' ? i : i + 1;
        bool closed = false;
        for (; j < segEnd; ++j) {
          if (buf[j] == close && (open != '{' || --nest == 0)) {
            closed = true;
            break;
          }
          if (open == '{' && buf[j] == '{') ++nest;
        }
        if (!closed) {
          if (!joined && s + 1 < segCount) return TokenizeStatus::NeedsJoin;
          error.message = open == '{'    ? "unterminated '{' (no closing '}')"
                          : open == '\'' ? "unterminated quoted expression (no closing ')"
                                         : "unterminated string (no closing \")";
          // Report where the group opened: find its segment.
          std::size_t seg = s;
          while (seg > 0 && i < segs[seg].begin) --seg;
          error.line = segs[seg].line;
          error.column = column(i, seg);
          return TokenizeStatus::Unterminated;
        }
        i = j + 1;
        continue;
      }
      ++i;
    }
    out.push_back({buf.substr(start, i - start), segs[startSeg].line, column(start, startSeg)});
    // A joined group may have carried us into a later segment.
    while (s + 1 < segCount && i >= segs[s].end) ++s;
  }
  return TokenizeStatus::Ok;
}

} // namespace

bool SpiceCardScanner::next(SpiceCard &card) {
  while (pos_ < text_.size()) {
    Line l = peekAt_ == pos_ ? Line{pos_, peekContentEnd_, peekNext_} : lineAt(text_, pos_);
    std::uint32_t lineNo = line_;
    pos_ = l.next;
    ++line_;
    std::size_t i = firstNonBlank(text_, l.begin, l.contentEnd);
    if (i == l.contentEnd || isCommentStart(text_[i])) continue;
    card.begin = static_cast<std::uint32_t>(i);
    card.end = static_cast<std::uint32_t>(l.contentEnd);
    card.line = lineNo;
    card.column = static_cast<std::uint32_t>(i - l.begin + 1);
    card.orphanContinuation = text_[i] == '+';
    card.continued = false;
    if (card.orphanContinuation) return true;
    // Continuations, possibly after comment or blank lines.
    std::size_t p = pos_;
    std::uint32_t ln = line_;
    while (p < text_.size()) {
      Line c = lineAt(text_, p);
      std::size_t j = firstNonBlank(text_, c.begin, c.contentEnd);
      if (j == c.contentEnd || isCommentStart(text_[j])) {
        p = c.next;
        ++ln;
        continue;
      }
      if (text_[j] != '+') {
        peekAt_ = p;
        peekContentEnd_ = c.contentEnd;
        peekNext_ = c.next;
        break;
      }
      card.end = static_cast<std::uint32_t>(c.contentEnd);
      card.continued = true;
      p = c.next;
      ++ln;
      pos_ = p;
      line_ = ln;
    }
    return true;
  }
  return false;
}

bool SpiceCardScanner::skipPastLineStartingWith(std::string_view word) {
  while (pos_ < text_.size()) {
    Line l = lineAt(text_, pos_);
    pos_ = l.next;
    ++line_;
    std::size_t i = firstNonBlank(text_, l.begin, l.contentEnd);
    std::size_t k = 0;
    while (k < word.size() && i + k < l.contentEnd && lowerAscii(text_[i + k]) == lowerAscii(word[k])) ++k;
    if (k == word.size() && (i + k == l.contentEnd || isSeparator(text_[i + k]) || text_[i + k] == ';'))
      return true;
  }
  return false;
}

bool tokenizeSpiceCard(std::string_view text, const SpiceCard &card, std::vector<SpiceToken> &out,
                       std::deque<std::string> &arena, SpiceTokenError &error) {
  out.clear();
  // Fast path: one physical line.
  Segment first{card.begin, card.end, card.line, card.column};
  if (!card.continued) {
    return tokenizeSegments(text, &first, 1, false, out, error) == TokenizeStatus::Ok;
  }
  // Several physical lines: collect the card's own lines and the continuations.
  std::vector<Segment> segs;
  std::size_t pos = card.begin;
  std::uint32_t lineNo = card.line;
  bool firstLine = true;
  while (pos < card.end) {
    Line l = lineAt(text, pos);
    std::size_t contentEnd = l.contentEnd < card.end ? l.contentEnd : card.end;
    if (firstLine) {
      segs.push_back({pos, contentEnd, lineNo, card.column});
      firstLine = false;
    } else {
      std::size_t j = firstNonBlank(text, l.begin, contentEnd);
      if (j < contentEnd && text[j] == '+')
        segs.push_back({j + 1, contentEnd, lineNo, static_cast<std::uint32_t>(j + 1 - l.begin + 1)});
    }
    pos = l.next;
    ++lineNo;
  }
  TokenizeStatus st = TokenizeStatus::Ok;
  for (std::size_t k = 0; k < segs.size(); ++k) {
    // A group still open at the end of a line that has continuations asks for a joined retry.
    st = tokenizeSegments(text, &segs[k], 1, false, out, error);
    if (st == TokenizeStatus::Unterminated && k + 1 < segs.size()) st = TokenizeStatus::NeedsJoin;
    if (st != TokenizeStatus::Ok) break;
  }
  if (st == TokenizeStatus::Ok) return true;
  if (st == TokenizeStatus::Unterminated) return false;
  // Retry on a joined copy: segments separated by one blank, positions mapped back per segment.
  out.clear();
  std::string &joined = arena.emplace_back();
  std::vector<Segment> jsegs;
  for (const Segment &sg : segs) {
    std::size_t b = joined.size();
    joined.append(text.substr(sg.begin, sg.end - sg.begin));
    jsegs.push_back({b, joined.size(), sg.line, sg.columnOfBegin});
    joined.push_back(' ');
  }
  return tokenizeSegments(joined, jsegs.data(), jsegs.size(), true, out, error) == TokenizeStatus::Ok;
}

bool groupSpiceWords(const std::vector<SpiceToken> &tokens, std::size_t first,
                     std::vector<SpiceWord> &out, SpiceTokenError &error) {
  out.clear();
  auto isParamsKeyword = [](std::string_view t) {
    if (t.size() < 7) return false;
    static constexpr std::string_view kw = "params:";
    for (std::size_t i = 0; i < kw.size(); ++i)
      if (lowerAscii(t[i]) != kw[i]) return false;
    return true;
  };
  for (std::size_t i = first; i < tokens.size(); ++i) {
    SpiceToken t = tokens[i];
    if (isParamsKeyword(t.text)) {
      if (t.text.size() == 7) continue;
      t.text.remove_prefix(7);
      t.column += 7;
    }
    if (t.text == "=") {
      error.message = "'=' without a name before it";
      error.line = t.line;
      error.column = t.column;
      return false;
    }
    if (i + 1 < tokens.size() && tokens[i + 1].text == "=") {
      if (i + 2 >= tokens.size() || tokens[i + 2].text == "=") {
        error.message = "missing value after '" + std::string(t.text) + "='";
        error.line = tokens[i + 1].line;
        error.column = tokens[i + 1].column;
        return false;
      }
      out.push_back({t, tokens[i + 2], true});
      i += 2;
      continue;
    }
    out.push_back({t, {}, false});
  }
  return true;
}

} // namespace gateloop
