from curator.cli.main import main

raise SystemExit(main())
