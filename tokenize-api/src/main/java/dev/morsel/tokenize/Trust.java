package dev.morsel.tokenize;

/**
 * Whether a text may contain control tokens. Text from users, documents or the web is
 * {@link #UNTRUSTED}: spellings of control tokens in it are encoded as ordinary text, so nobody can
 * inject a control token by typing its spelling. Only text the caller wrote (a prompt template, say)
 * should be {@link #TRUSTED}.
 *
 * @since 0.1.0
 */
public enum Trust {
  /** Control-token spellings are ordinary text. The default everywhere. */
  UNTRUSTED,
  /** Exact control-token spellings (leftmost-longest, in the original text) become control tokens. */
  TRUSTED
}
