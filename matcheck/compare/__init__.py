"""Compare lesson versions: tolerances, verdicts, content alignment."""
