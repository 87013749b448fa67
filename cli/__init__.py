"""Command line, terminal summary, JSON record and output files."""
