"""Records: proposals (one pre-filled record per reported data point) assembled from nlp output."""
