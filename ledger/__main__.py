from ledger.cli import main

main()
