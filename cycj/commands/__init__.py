"""Click commands, one module per job; each is a thin call into the library."""
