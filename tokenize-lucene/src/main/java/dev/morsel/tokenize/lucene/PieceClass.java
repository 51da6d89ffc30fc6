package dev.morsel.tokenize.lucene;

import com.ibm.icu.lang.UCharacter;
import com.ibm.icu.lang.UProperty;

/**
 * The class of a token's text, written to Lucene's {@code TypeAttribute} as {@link #type()}.
 *
 * <p>A token's class is that of the first code point of its original span that is not
 * {@code White_Space} (the space a piece carries in front of a word does not count); a span of
 * whitespace only is {@link #NEWLINE} if it holds a line break, else {@link #SPACE}. The classes
 * follow the Unicode general categories the rule-based splitting uses, so under that splitting a
 * token's class is the class of its piece.
 *
 * @since 0.1.0
 */
public enum PieceClass {
  /** General category L* except ideographs: {@code "letters"}. */
  LETTERS("letters"),
  /** Decimal digits, category Nd: {@code "digits"}. */
  DIGITS("digits"),
  /** {@code Unified_Ideograph} code points: {@code "ideograph"}. */
  IDEOGRAPH("ideograph"),
  /** General category M* with nothing before it in the token: {@code "mark"}. */
  MARK("mark"),
  /** General category P*: {@code "punctuation"}. */
  PUNCTUATION("punctuation"),
  /** General category S* (emoji included): {@code "symbol"}. */
  SYMBOL("symbol"),
  /** Whitespace without a line break: {@code "space"}. */
  SPACE("space"),
  /** Whitespace with a line break: {@code "newline"}. */
  NEWLINE("newline"),
  /** Anything else (other numbers, controls, format characters, unassigned): {@code "other"}. */
  OTHER("other");

  private static final PieceClass[] VALUES = values();
  /** Class ordinal of each char below U+0080 (whitespace marked by SPACE, line breaks by NEWLINE). */
  private static final byte[] ASCII = new byte[128];

  static {
    for (int c = 0; c < 128; c++) {
      ASCII[c] = (byte) (isLineBreak(c) ? NEWLINE : isWhiteSpace(c) ? SPACE : classify(c)).ordinal();
    }
  }

  private final String type;

  PieceClass(String type) {
    this.type = type;
  }

  /** The token type Lucene sees, for example {@code "letters"}. */
  public String type() {
    return type;
  }

  /** The class of the text {@code chars[start, end)} (see the class comment); {@link #SPACE} if empty. */
  static PieceClass of(char[] chars, int start, int end) {
    boolean lineBreak = false;
    int i = start;
    while (i < end) {
      char c = chars[i];
      if (c < 128) {
        PieceClass k = VALUES[ASCII[c]];
        if (k != SPACE && k != NEWLINE) {
          return k;
        }
        lineBreak |= k == NEWLINE;
        i++;
      } else {
        int cp = Character.codePointAt(chars, i, end);
        if (!isWhiteSpace(cp)) {
          return classify(cp);
        }
        lineBreak |= isLineBreak(cp);
        i += Character.charCount(cp);
      }
    }
    return lineBreak ? NEWLINE : SPACE;
  }

  private static boolean isWhiteSpace(int cp) {
    return UCharacter.hasBinaryProperty(cp, UProperty.WHITE_SPACE);
  }

  private static boolean isLineBreak(int cp) {
    return (cp >= 0x0A && cp <= 0x0D) || cp == 0x85 || cp == 0x2028 || cp == 0x2029;
  }

  /** The class of a code point that is not whitespace. */
  static PieceClass classify(int cp) {
    if (UCharacter.hasBinaryProperty(cp, UProperty.UNIFIED_IDEOGRAPH)) {
      return IDEOGRAPH;
    }
    switch (UCharacter.getType(cp)) {
      case UCharacter.UPPERCASE_LETTER:
      case UCharacter.LOWERCASE_LETTER:
      case UCharacter.TITLECASE_LETTER:
      case UCharacter.MODIFIER_LETTER:
      case UCharacter.OTHER_LETTER:
        return LETTERS;
      case UCharacter.DECIMAL_DIGIT_NUMBER:
        return DIGITS;
      case UCharacter.NON_SPACING_MARK:
      case UCharacter.ENCLOSING_MARK:
      case UCharacter.COMBINING_SPACING_MARK:
        return MARK;
      case UCharacter.CONNECTOR_PUNCTUATION:
      case UCharacter.DASH_PUNCTUATION:
      case UCharacter.START_PUNCTUATION:
      case UCharacter.END_PUNCTUATION:
      case UCharacter.INITIAL_PUNCTUATION:
      case UCharacter.FINAL_PUNCTUATION:
      case UCharacter.OTHER_PUNCTUATION:
        return PUNCTUATION;
      case UCharacter.MATH_SYMBOL:
      case UCharacter.CURRENCY_SYMBOL:
      case UCharacter.MODIFIER_SYMBOL:
      case UCharacter.OTHER_SYMBOL:
        return SYMBOL;
      default:
        return OTHER;
    }
  }
}
