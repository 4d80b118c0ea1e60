/** What `--help` says about the cache, on every command that computes targets (its own module: the TUI's help loads no targets engine). */
export const cacheHelp =
  '  --cache DIR  where computed targets are kept (else $PROBEBOOK_CACHE, else $XDG_CACHE_HOME/probebook,\n' +
  "               i.e. ~/.cache/probebook): in the user's cache folder even when --log is given; safe to delete\n";
