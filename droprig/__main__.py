from droprig.cli import main

raise SystemExit(main())
