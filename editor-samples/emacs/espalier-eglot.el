;;; espalier-eglot.el --- The espalier language server through eglot  -*- lexical-binding: t; -*-

;;; Commentary:
;; Grammar files (.abnf, `abnf-mode') and the sample files an espalier-samples.json maps
;; (`espalier-sample-mode') are handed to `espalier serve' by eglot (built in since Emacs 29; from
;; GNU ELPA before).  In init.el:
;;
;;   (add-to-list 'load-path "/path/to/espalier/editor-samples/emacs")
;;   (setq espalier-server-command '("/path/to/espalier/espalier" "serve"))
;;   (require 'espalier-eglot)
;;   (add-hook 'abnf-mode-hook #'eglot-ensure)
;;   (add-hook 'espalier-sample-mode-hook #'eglot-ensure)

;;; Code:

(require 'abnf-mode)
(require 'json)
(require 'subr-x)
(require 'seq)

(defvar eglot-server-programs)

(defgroup espalier nil
  "The espalier language server."
  :group 'languages)

(defcustom espalier-server-command '("espalier" "serve")
  "Program and arguments that run the espalier language server.
The repository's launcher, e.g. (\"/path/to/espalier/espalier\" \"serve\"), or
\(\"java\" \"-jar\" \"/path/to/espalier.jar\" \"serve\")."
  :type '(repeat string))

(defconst espalier-sample-map "espalier-samples.json"
  "The workspace file that maps sample files to a constraint and a vocabulary.")

(defun espalier--server-command (&optional _interactive)
  "The command eglot runs (read when the server starts)."
  espalier-server-command)

;;;###autoload
(define-minor-mode espalier-sample-mode
  "A sample output checked by the espalier language server.
Errors show where the text leaves the language; completion at point
lists the tokens the constraint allows next."
  :lighter " Sample"
  ;; a sample keeps its major mode (text, JSON, ...) and eglot picks a server by major mode: in
  ;; this buffer, ours comes first
  (when espalier-sample-mode
    (setq-local eglot-server-programs
                (cons (cons major-mode #'espalier--server-command)
                      (and (boundp 'eglot-server-programs) eglot-server-programs)))))

(defun espalier--glob-regexp (glob)
  "A regexp for GLOB, read as the server reads them (java.nio globs).
* and ? stay in one folder, ** crosses folders, {a,b} is a choice,
[...] is a class ([!...] negated)."
  (let ((i 0) (n (length glob)) (out "\\`") (depth 0))
    (while (< i n)
      (let ((c (aref glob i)))
        (cond
         ((and (eq c ?*) (< (1+ i) n) (eq (aref glob (1+ i)) ?*))
          (setq out (concat out ".*") i (1+ i)))
         ((eq c ?*) (setq out (concat out "[^/]*")))
         ((eq c ??) (setq out (concat out "[^/]")))
         ((and (eq c ?\[) (string-match "\\[\\(!?\\)\\([^]]*\\)\\]" glob i) (= (match-beginning 0) i))
          (setq out (concat out "[" (if (string-empty-p (match-string 1 glob)) "" "^")
                            (match-string 2 glob) "]")
                i (1- (match-end 0))))
         ((eq c ?{) (setq out (concat out "\\(?:") depth (1+ depth)))
         ((and (eq c ?}) (> depth 0)) (setq out (concat out "\\)") depth (1- depth)))
         ((and (eq c ?,) (> depth 0)) (setq out (concat out "\\|")))
         (t (setq out (concat out (regexp-quote (string c))))))
        (setq i (1+ i))))
    (concat out "\\'")))

(defun espalier-sample-file-p (file)
  "Whether the nearest espalier-samples.json above FILE maps it."
  (when-let* ((dir (locate-dominating-file file espalier-sample-map))
              (map (ignore-errors
                     (let ((json-object-type 'alist) (json-array-type 'list))
                       (json-read-file (expand-file-name espalier-sample-map dir))))))
    (let ((relative (file-relative-name file dir)))
      (seq-some (lambda (entry)
                  (let ((files (alist-get 'files entry)))
                    (seq-some (lambda (glob)
                                (and (stringp glob)
                                     (string-match-p (espalier--glob-regexp glob) relative)))
                              (if (stringp files) (list files) files))))
                (alist-get 'samples map)))))

(defun espalier--maybe-sample ()
  "Turn on `espalier-sample-mode' in a buffer whose file is a mapped sample."
  (when (and buffer-file-name (espalier-sample-file-p buffer-file-name))
    (espalier-sample-mode 1)))

(add-hook 'find-file-hook #'espalier--maybe-sample)


(with-eval-after-load 'eglot
  (add-to-list 'eglot-server-programs '(abnf-mode . espalier--server-command)))

(provide 'espalier-eglot)
;;; espalier-eglot.el ends here
