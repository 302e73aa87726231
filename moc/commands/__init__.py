"""One module per `moc` command (see moc/cli.py for the protocol)."""
