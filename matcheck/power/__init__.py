"""Power, sample size and sensitivity for the designs of education studies (docs/power.md)."""
