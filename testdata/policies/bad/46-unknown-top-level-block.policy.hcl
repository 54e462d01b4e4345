polcy "x" { # want policy "Unsupported block type" "Did you mean \x22policy\x22\?"
}
