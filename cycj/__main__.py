from cycj.cli import main

main()
