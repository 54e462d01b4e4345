# nothing here # want policy "Missing policy block" "one block"
