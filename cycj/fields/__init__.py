"""Real stress fields (issue #9): profiles, weight-function K, residual stress, notches."""
