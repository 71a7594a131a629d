from geomjoint.cli import main

raise SystemExit(main())
