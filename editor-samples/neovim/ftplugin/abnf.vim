" ABNF comments start with a semicolon.
setlocal commentstring=;\ %s comments=:;
let b:undo_ftplugin = 'setlocal commentstring< comments<'
