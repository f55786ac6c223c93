import sys

from ctllint._entry import main

sys.exit(main())
