from satorder.cli.main import main

raise SystemExit(main())
