from matcheck.cli import main

raise SystemExit(main())
