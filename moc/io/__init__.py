"""Input and output at the edge: case files, saved results, exports."""
