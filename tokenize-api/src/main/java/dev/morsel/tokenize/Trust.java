package dev.morsel.tokenize;

/**
 * Whether a text may contain reserved tokens. Text from users, documents or the web is
 * {@link #UNTRUSTED}: spellings of reserved tokens in it are encoded as ordinary text, so nobody can
 * inject a reserved token by typing its spelling. Only text the caller wrote (a prompt template, say)
 * should be {@link #TRUSTED}.
 *
 * @since 0.1.0
 */
public enum Trust {
  /** Reserved-token spellings are ordinary text. The default everywhere. */
  UNTRUSTED,
  /** Exact reserved-token spellings (leftmost-longest, in the original text) become reserved tokens. */
  TRUSTED
}
