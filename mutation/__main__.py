import sys

from mutation.run import main

sys.exit(main())
