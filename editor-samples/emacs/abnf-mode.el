;;; abnf-mode.el --- Major mode for ABNF grammars (RFC 5234, RFC 7405)  -*- lexical-binding: t; -*-

;;; Commentary:
;; Highlighting for .abnf files with the token shapes of
;; editor-samples/vscode/syntaxes/abnf.tmLanguage.json: comments, the ;@use import directive, rule
;; names where they are defined, = and =/, strings (also %s"..." and %i"..."), %x/%d/%b values,
;; repetitions and the RFC 5234 core rules.  Checking comes from the espalier language server
;; (see espalier-eglot.el).

;;; Code:

(defvar abnf-mode-syntax-table
  (let ((table (make-syntax-table)))
    (modify-syntax-entry ?\; "<" table)
    (modify-syntax-entry ?\n ">" table)
    (modify-syntax-entry ?\" "\"" table)
    (modify-syntax-entry ?- "_" table)
    (modify-syntax-entry ?% "'" table)
    (modify-syntax-entry ?< "(>" table)
    (modify-syntax-entry ?> ")<" table)
    (modify-syntax-entry ?\' "." table)
    table)
  "Syntax table of `abnf-mode'.")

(defconst abnf-core-rules
  '("ALPHA" "BIT" "CHAR" "CR" "CRLF" "CTL" "DIGIT" "DQUOTE" "HEXDIG" "HTAB" "LF" "LWSP"
    "OCTET" "SP" "VCHAR" "WSP")
  "The core rules of RFC 5234 Appendix B.")

(defconst abnf-font-lock-keywords
  `((";@use\\_>" 0 font-lock-preprocessor-face t)
    ("^[ \t]*\\([A-Za-z][A-Za-z0-9-]*\\)[ \t]*\\(=/?\\)"
     (1 font-lock-function-name-face) (2 font-lock-keyword-face))
    ("\\(%[sSiI]\\)\"" 1 font-lock-builtin-face)
    ("%[xX][0-9A-Fa-f]+\\(?:\\(?:\\.[0-9A-Fa-f]+\\)+\\|-[0-9A-Fa-f]+\\)?" . font-lock-constant-face)
    ("%[dD][0-9]+\\(?:\\(?:\\.[0-9]+\\)+\\|-[0-9]+\\)?" . font-lock-constant-face)
    ("%[bB][01]+\\(?:\\(?:\\.[01]+\\)+\\|-[01]+\\)?" . font-lock-constant-face)
    ("<[^>\n]*>" . font-lock-doc-face)
    ("\\([0-9]*\\*[0-9]*\\)\\|\\_<\\([0-9]+\\)"
     (1 font-lock-keyword-face nil t) (2 font-lock-keyword-face nil t))
    (,(concat "\\(?:\\_<\\|[0-9*]\\)" (regexp-opt abnf-core-rules t) "\\_>")
     1 font-lock-type-face)
    ("/" . font-lock-keyword-face))
  "Highlighting of `abnf-mode'.")

;;;###autoload
(define-derived-mode abnf-mode prog-mode "ABNF"
  "Major mode for ABNF grammar files."
  :syntax-table abnf-mode-syntax-table
  (setq-local comment-start "; ")
  (setq-local comment-start-skip ";+[ \t]*")
  (setq-local font-lock-defaults '(abnf-font-lock-keywords nil t)))

;;;###autoload
(add-to-list 'auto-mode-alist '("\\.abnf\\'" . abnf-mode))

(provide 'abnf-mode)
;;; abnf-mode.el ends here
