" ABNF (RFC 5234, RFC 7405) highlighting for Neovim versions without semantic tokens from the
" server; the token shapes follow editor-samples/vscode/syntaxes/abnf.tmLanguage.json.
if exists('b:current_syntax')
  finish
endif

syntax case match
syntax match abnfReference /\<\a[[:alnum:]-]*/
syntax match abnfCoreRule /\c\<\%(ALPHA\|BIT\|CHAR\|CRLF\|CR\|CTL\|DIGIT\|DQUOTE\|HEXDIG\|HTAB\|LF\|LWSP\|OCTET\|SP\|VCHAR\|WSP\)[[:alnum:]-]\@!/
syntax match abnfDefinition /^\s*\a[[:alnum:]-]*\ze\s*=/
syntax match abnfOperator /=\/\?/
syntax match abnfOperator /\//
syntax match abnfRepeat /\d*\*\d*\|\<\d\+/
syntax match abnfNumeric /%[xX]\x\+\%(\%(\.\x\+\)\+\|-\x\+\)\?/
syntax match abnfNumeric /%[dD]\d\+\%(\%(\.\d\+\)\+\|-\d\+\)\?/
syntax match abnfNumeric /%[bB][01]\+\%(\%(\.[01]\+\)\+\|-[01]\+\)\?/
syntax match abnfString /\%(%[sSiI]\)\?"[^"]*"/
syntax match abnfProse /<[^>]*>/
syntax match abnfComment /;.*$/ contains=abnfImport
syntax match abnfImport /;@use\>/ contained

highlight default link abnfReference Identifier
highlight default link abnfCoreRule Constant
highlight default link abnfDefinition Function
highlight default link abnfOperator Operator
highlight default link abnfRepeat Operator
highlight default link abnfNumeric Number
highlight default link abnfString String
highlight default link abnfProse Special
highlight default link abnfComment Comment
highlight default link abnfImport Include

let b:current_syntax = 'abnf'
