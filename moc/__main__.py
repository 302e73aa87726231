from moc.cli import main

raise SystemExit(main())
