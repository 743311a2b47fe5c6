"""Pure engineering functions of numbers, one module per domain. No knowledge of files or rules."""
