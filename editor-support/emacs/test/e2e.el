;;; e2e.el --- End-to-end test of syzygy-mode with Eglot and the real `syz lsp'  -*- lexical-binding: t; -*-

;; Run from test.sh as
;;   emacs -Q --batch -l editor-support/emacs/test/e2e.el
;; Opens a copy of an example with one deliberate unit mistake through the mode's
;; auto-mode entry, checks highlighting, starts Eglot the way `M-x eglot' would (from
;; `eglot-server-programs', where the mode registers itself), waits for the server's
;; diagnostics and asks for hover.  Prints one line per check; exits non-zero when any fails.

;;; Code:

(require 'cl-lib)

(defconst syzygy-test--here
  (file-name-directory (or load-file-name buffer-file-name)))
(defconst syzygy-test--support
  (expand-file-name "../.." syzygy-test--here))
(defconst syzygy-test--fixture
  (expand-file-name "fixtures/veyra-unit-error.syz" syzygy-test--support))
(defconst syzygy-test--timeout
  (/ (string-to-number (or (getenv "SYZYGY_TEST_TIMEOUT_MS") "30000")) 1000.0))

(defvar syzygy-test--passed 0)
(defvar syzygy-test--failed 0)

(defun syzygy-test--say (fmt &rest args)
  (princ (concat (apply #'format fmt args) "\n")))

(defun syzygy-test--check (name ok &optional detail)
  (if ok
      (progn (cl-incf syzygy-test--passed) (syzygy-test--say "  ok   %s" name))
    (cl-incf syzygy-test--failed)
    (syzygy-test--say "  FAIL %s%s" name (if detail (format ": %s" detail) "")))
  ok)

(defun syzygy-test--wait (pred)
  "Run timers and process output until PRED holds or the timeout passes."
  (let ((deadline (+ (float-time) syzygy-test--timeout)))
    (while (and (not (funcall pred)) (< (float-time) deadline))
      (accept-process-output nil 0.05))
    (funcall pred)))

(defun syzygy-test--goto (text &optional nth)
  "Move to the start of the NTH occurrence of TEXT in the buffer."
  (goto-char (point-min))
  (search-forward text nil nil (or nth 1))
  (goto-char (match-beginning 0)))

(defun syzygy-test--face-at (text &optional nth)
  (save-excursion
    (syzygy-test--goto text nth)
    (let ((f (get-text-property (point) 'face)))
      (if (listp f) (car f) f))))

;; Eglot as Debian installs it; a normal Emacs start activates it through site-start,
;; which -Q skips.
(require 'package)
(add-to-list 'package-directory-list "/usr/share/emacs/site-lisp/elpa")
(package-initialize)
(add-to-list 'load-path (expand-file-name "emacs" syzygy-test--support))

(defun syzygy-test--run ()
  (syzygy-test--say "emacs %s" emacs-version)
  (require 'syzygy-mode)
  (require 'eglot)
  (syzygy-test--say "eglot from %s" (locate-library "eglot"))
  (find-file syzygy-test--fixture)
  (syzygy-test--check "the file opens in syzygy-mode" (eq major-mode 'syzygy-mode) major-mode)
  (font-lock-ensure)
  (dolist (e '(("# A copy" 1 font-lock-comment-delimiter-face)
               ("ref" 1 font-lock-keyword-face)
               ("rv1" 1 syzygy-citation-face)
               ("veyra {" 1 syzygy-body-face)
               ("mass" 1 syzygy-quantity-face)
               ("0.93" 1 syzygy-number-face)
               ("±" 1 syzygy-uncertainty-face)
               ("Msun" 1 syzygy-unit-face)
               ("rv1]" 1 syzygy-citation-face)
               ("\"K0V\"" 1 font-lock-string-face)
               ("b orbits" 1 syzygy-body-face)
               ("assumed" 1 font-lock-keyword-face)
               ("m/s      [rv1]" 1 syzygy-unit-face)))
    (let ((got (syzygy-test--face-at (nth 0 e) (nth 1 e))))
      (syzygy-test--check (format "'%s' has %s" (nth 0 e) (nth 2 e)) (eq got (nth 2 e)) got)))
  (syzygy-test--check "comment-start is \"# \"" (equal comment-start "# ") comment-start)

  ;; What M-x eglot would start here, found through `eglot-server-programs'.
  (let* ((guess (eglot--guess-contact))
         (contact (nth 3 guess)))
    (syzygy-test--check "eglot finds the syz lsp registration"
                        (equal contact syzygy-server-command) guess)
    (apply #'eglot guess))
  (syzygy-test--check "eglot manages the buffer"
                      (syzygy-test--wait (lambda () (and (eglot-current-server)
                                                         (bound-and-true-p eglot--managed-mode))))
                      (eglot-current-server))
  (let ((server (eglot-current-server)))
    (unless server (error "No server"))
    ;; Flymake defers its first run to the next command, and batch mode runs none.
    (flymake-start)
    (let ((line (save-excursion (syzygy-test--goto "period       = 3.5 m/s") (line-number-at-pos))))
      (syzygy-test--check "the server's diagnostics reach flymake"
                          (syzygy-test--wait (lambda () (flymake-diagnostics))))
      (let* ((diags (flymake-diagnostics))
             (errors (cl-remove-if-not (lambda (d) (eq (flymake-diagnostic-type d) 'eglot-error)) diags))
             (texts (mapcar #'flymake-diagnostic-text diags))
             (unit (cl-find-if (lambda (d) (string-prefix-p "syzygy [unit-mismatch]: "
                                                            (flymake-diagnostic-text d)))
                               errors)))
        (syzygy-test--check "exactly one error" (= (length errors) 1) texts)
        (when (syzygy-test--check "the unit-mismatch error is reported" unit texts)
          (syzygy-test--check "... on the line of the mistake"
                              (= (line-number-at-pos (flymake-diagnostic-beg unit)) line)
                              (line-number-at-pos (flymake-diagnostic-beg unit)))
          (syzygy-test--check "... saying a period is a time"
                              (string-match-p "time" (flymake-diagnostic-text unit))
                              (flymake-diagnostic-text unit)))))
    ;; Hover on planet b's name, through eglot's connection.
    (syzygy-test--goto "b orbits")
    (let* ((hover (jsonrpc-request server :textDocument/hover
                                   (eglot--TextDocumentPositionParams)
                                   :timeout syzygy-test--timeout))
           (contents (plist-get hover :contents))
           (text (cond ((stringp contents) contents)
                       ((plist-get contents :value))
                       (t (format "%S" contents)))))
      (syzygy-test--check "hover on planet b answers" (and text (> (length text) 0)) hover)
      (syzygy-test--check "hover lists b's density as derived"
                          (string-match-p "|[ \t]*density[ \t]*|[^|\n]*g/cm\\^3[^|\n]*|[ \t]*derived" text)
                          text))
    ;; A missing server gets a message that says what to do.
    (let* ((syzygy-server-command '("syz-not-installed-here" "lsp"))
           (message (condition-case err (progn (syzygy-server-contact) nil)
                      (user-error (error-message-string err)))))
      (syzygy-test--check "a missing server is reported with how to install it"
                          (and message
                               (string-match-p "syz-not-installed-here.? was not found" message)
                               (string-match-p "cargo install" message))
                          message))
    ;; Eglot sends `shutdown' with "params": null, then `exit'; keep its log to read.
    (eglot-shutdown server nil nil t)
    (syzygy-test--check "the connection is closed after shutdown"
                        (syzygy-test--wait (lambda () (not (jsonrpc-running-p server)))))
    (with-current-buffer (jsonrpc-events-buffer server)
      (let* ((log (buffer-string))
             (id (and (string-match ":id \\([0-9]+\\) :method \"shutdown\"" log)
                      (match-string 1 log))))
        (syzygy-test--check "the server answered shutdown without an error"
                            (and id (string-match-p
                                     (concat "\\[server-reply\\] (id:" id ")[^\n]*\n"
                                             "(:jsonrpc \"2.0\" :result nil :id " id ")")
                                     log))
                            (and id (substring log (string-match (concat "(id:" id ")") log))))
        (syzygy-test--check "no request of the session got an error reply"
                            (not (string-match-p ":error" log))
                            log)))))

(condition-case err
    (syzygy-test--run)
  (error (syzygy-test--check "the test ran to the end" nil (error-message-string err))))
(syzygy-test--say "emacs: %d checks ok, %d failing" syzygy-test--passed syzygy-test--failed)
(kill-emacs (if (> syzygy-test--failed 0) 1 0))

;;; e2e.el ends here
