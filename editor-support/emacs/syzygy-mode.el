;;; syzygy-mode.el --- Major mode for Syzygy .syz files  -*- lexical-binding: t; -*-

;; Version: 0.1.0
;; Package-Requires: ((emacs "27.1"))
;; Keywords: languages
;; SPDX-License-Identifier: MIT OR Apache-2.0

;;; Commentary:

;; Highlighting and editing for Syzygy's `.syz' files (stars, planets and their
;; measurements with units, uncertainties and citations), and the registration of
;; the Syzygy language server, `syz lsp', with Eglot:
;;
;;   (add-to-list 'load-path "/path/to/syzygy/editor-support/emacs")
;;   (require 'syzygy-mode)
;;   (add-hook 'syzygy-mode-hook #'eglot-ensure)
;;
;; The names below are kept in step with the language's lexer and quantity table;
;; editor-support/check-names.py checks that they are.

;;; Code:

(require 'rx)

(defgroup syzygy nil
  "Editing Syzygy system descriptions."
  :group 'languages
  :prefix "syzygy-")

(defcustom syzygy-server-command '("syz" "lsp")
  "The command that runs the Syzygy language server.
The first element is looked up on `exec-path' unless it is a full path."
  :type '(repeat string)
  :group 'syzygy)

(defcustom syzygy-indent-offset 2
  "Indentation of one level of braces."
  :type 'integer
  :safe #'integerp
  :group 'syzygy)

(defface syzygy-number-face '((t :inherit font-lock-constant-face))
  "Face for numbers." :group 'syzygy)
(defface syzygy-unit-face '((t :inherit font-lock-type-face))
  "Face for units after a number." :group 'syzygy)
(defface syzygy-uncertainty-face '((t :inherit font-lock-builtin-face))
  "Face for uncertainty operators and limits." :group 'syzygy)
(defface syzygy-quantity-face '((t :inherit font-lock-variable-name-face))
  "Face for quantity names." :group 'syzygy)
(defface syzygy-body-face '((t :inherit font-lock-function-name-face))
  "Face for the names of stars and planets." :group 'syzygy)
(defface syzygy-citation-face '((t :inherit font-lock-constant-face))
  "Face for citation and reference ids." :group 'syzygy)

(defconst syzygy-keywords
  '("system" "star" "planet" "orbits" "ref" "let" "assumed" "preferred")
  "Keywords of the language.")

(defconst syzygy-quantity-names
  '(;; star
    "mass" "M" "radius" "R" "teff" "Teff" "T_eff" "luminosity" "L" "log_g" "logg"
    "density" "rho" "metallicity" "feh" "FeH" "age" "distance" "dist" "parallax" "plx"
    "spectral_type" "sptype" "SpT"
    ;; planet
    "period" "P" "semi_major_axis" "a" "sma" "eccentricity" "e" "inclination" "i"
    "impact" "b" "impact_parameter" "arg_periastron" "omega" "ω" "rv_amplitude"
    "K" "K_rv" "min_mass" "msini" "Msini" "m_sin_i" "Mp" "Rp" "radius_ratio" "k" "rp_rs"
    "Rp_Rs" "transit_depth" "depth" "delta" "transit_duration" "T14" "duration"
    "transit_duration_full" "T23" "transit_epoch" "T0" "epoch" "scaled_semi_major_axis"
    "a_rs" "a_Rs" "albedo" "A" "bond_albedo" "redistribution" "f" "surface_gravity" "g"
    "escape_velocity" "v_esc" "orbital_speed" "v_orb" "hill_radius" "r_hill" "teq" "Teq"
    "T_eq" "insolation" "S" "flux"
    ;; planning
    "M_bol" "absolute_bolometric_magnitude" "bolometric_flux" "bolometric_magnitude" "dec"
    "declination" "esm" "f_bol" "habitable_inner" "habitable_inner_insolation"
    "habitable_inner_optimistic" "habitable_inner_optimistic_insolation" "habitable_outer"
    "habitable_outer_insolation" "habitable_outer_optimistic"
    "habitable_outer_optimistic_insolation" "habitable_zone_position" "m_bol" "magnitude_h"
    "magnitude_j" "magnitude_ks" "magnitude_v" "mean_molecular_weight" "mu"
    "predicted_mass" "predicted_radius" "predicted_rv_amplitude" "ra" "right_ascension"
    "scale_height" "tsm")
  "Quantity names and their trade-symbol aliases, for stars and planets.")

(defconst syzygy-functions
  '("sqrt" "cbrt" "exp" "ln" "log10" "sin" "cos" "tan" "abs")
  "Functions available in expressions.")

(defconst syzygy-constants '("pi" "G" "c" "sigma_sb")
  "Named constants available in expressions.")

(defconst syzygy--ident-re "[A-Za-z_☉⊕°µμω][A-Za-z0-9_☉⊕µμω]*"
  "An identifier as the lexer reads one.")

(defconst syzygy--number-re
  "\\(?:[0-9]+\\(?:\\.[0-9]*\\)?\\|\\.[0-9]+\\)\\(?:[eE][-+]?[0-9]+\\)?"
  "A number literal.")

(defconst syzygy--uncertainty-re
  (concat "[ \t]*\\(?:\\(?:±\\|\\+-\\)[ \t]*" syzygy--number-re
          "\\|\\+[ \t]*" syzygy--number-re "[ \t]*/[ \t]*[-−][ \t]*" syzygy--number-re "\\)")
  "What may follow a number before its unit: a symmetric or an asymmetric error.")

(defconst syzygy--unit-factor-re
  (concat "\\(" syzygy--ident-re "\\|%\\)\\(?:[ \t]*\\^[ \t]*[-−]?[ \t]*[0-9]+\\)?")
  "One factor of a unit, with an optional whole exponent.")

(defvar syzygy-mode-syntax-table
  (let ((st (make-syntax-table)))
    (modify-syntax-entry ?# "<" st)
    (modify-syntax-entry ?\n ">" st)
    (modify-syntax-entry ?\" "\"" st)
    (modify-syntax-entry ?\\ "\\" st)
    (modify-syntax-entry ?_ "_" st)
    (modify-syntax-entry ?☉ "w" st)
    (modify-syntax-entry ?⊕ "w" st)
    (modify-syntax-entry ?µ "w" st)
    (modify-syntax-entry ?μ "w" st)
    (modify-syntax-entry ?ω "w" st)
    (modify-syntax-entry ?. "." st)
    (modify-syntax-entry ?± "." st)
    (modify-syntax-entry ?% "." st)
    (modify-syntax-entry ?^ "." st)
    (modify-syntax-entry ?< "." st)
    (modify-syntax-entry ?> "." st)
    (modify-syntax-entry ?{ "(}" st)
    (modify-syntax-entry ?} "){" st)
    (modify-syntax-entry ?\[ "(]" st)
    (modify-syntax-entry ?\] ")[" st)
    st)
  "Syntax table for `syzygy-mode'.")

(defun syzygy--in-code-p (pos)
  "Whether POS is outside comments and strings."
  (let ((ppss (save-excursion (syntax-ppss pos))))
    (not (or (nth 3 ppss) (nth 4 ppss)))))

(defun syzygy--match-unit (limit)
  "Font-lock matcher: the next unit written after a number, before LIMIT.
A unit follows the whole measurement (`0.93 ± 0.04 Msun'); it may be a product
(`km s^-1') or a quotient (`g/cm^3'); a keyword such as `assumed' is not one."
  (let (found)
    (while (and (not found)
                (re-search-forward syzygy--number-re limit t))
      (let ((num-start (match-beginning 0)))
        (when (and (syzygy--in-code-p num-start)
                   (not (and (> num-start (point-min))
                             (string-match-p "[A-Za-z0-9_.☉⊕µμω]"
                                             (string (char-before num-start))))))
          (when (looking-at syzygy--uncertainty-re)
            (goto-char (match-end 0)))
          (let ((start nil) (end nil) (first t) (more t))
            (while more
              (if (and (looking-at (concat (if first "[ \t]*" "\\(?:[ \t]*/[ \t]*\\|[ \t]+\\)")
                                           syzygy--unit-factor-re))
                       (<= (match-end 0) limit)
                       (not (member (match-string 1) syzygy-keywords)))
                  (progn
                    (unless start (setq start (match-beginning 1)))
                    (goto-char (match-end 0))
                    (setq end (point) first nil))
                (setq more nil)))
            (when start
              (set-match-data (list start end))
              (setq found t))))))
    found))

(defun syzygy--match-allow (limit)
  "Font-lock matcher: a silencing comment `# allow(rule-id)' before LIMIT."
  (let (found)
    (while (and (not found)
                (re-search-forward
                 "#[ \t]*\\(allow\\)[ \t]*([ \t]*\\([A-Za-z0-9_-]+\\)[ \t]*)" limit t))
      (when (nth 4 (save-excursion (syntax-ppss (match-end 1))))
        (setq found t)))
    found))

(defconst syzygy-font-lock-keywords
  (let ((id syzygy--ident-re)
        (property-start "\\(?:^\\|[{;]\\)[ \t]*"))
    `((syzygy--match-allow (1 'font-lock-preprocessor-face t) (2 'font-lock-constant-face t))
      (,(concat "\\_<\\(?:star\\|planet\\)[ \t]+\\(" id "\\)") 1 'syzygy-body-face)
      (,(concat "\\_<orbits[ \t]+\\(" id "\\)") 1 'syzygy-body-face)
      (,(concat "\\_<ref[ \t]+\\(" id "\\)") 1 'syzygy-citation-face)
      (,(concat "\\_<let[ \t]+\\(" id "\\)") 1 'font-lock-variable-name-face)
      (,(regexp-opt syzygy-keywords 'symbols) . 'font-lock-keyword-face)
      (,(concat property-start "\\(" (regexp-opt syzygy-quantity-names 'symbols) "\\)[ \t]*[=<>]")
       1 'syzygy-quantity-face)
      (,(concat "\\(" id "\\)[ \t]*\\.[ \t]*\\(" (regexp-opt syzygy-quantity-names 'symbols) "\\)?")
       (1 'syzygy-body-face) (2 'syzygy-quantity-face nil t))
      (,(concat (regexp-opt syzygy-functions 'symbols) "[ \t]*(") 1 'font-lock-builtin-face)
      (,(concat (regexp-opt syzygy-constants 'symbols) "\\(?:[^.]\\|$\\)") 1 'font-lock-constant-face)
      ("\\[\\([^]\n]*\\)\\]" (1 'syzygy-citation-face))
      (,(concat "\\(?:^\\|[^A-Za-z0-9_.☉⊕µμω]\\)\\(" syzygy--number-re "\\)") 1 'syzygy-number-face)
      ("±\\|\\+-" . 'syzygy-uncertainty-face)
      (,(concat "[0-9.][ \t]*\\(\\+\\)[ \t]*" syzygy--number-re "[ \t]*\\(/\\)[ \t]*\\([-−]\\)")
       (1 'syzygy-uncertainty-face) (2 'syzygy-uncertainty-face) (3 'syzygy-uncertainty-face))
      ("[<>]" . 'syzygy-uncertainty-face)
      (syzygy--match-unit . 'syzygy-unit-face)))
  "Highlighting for `syzygy-mode'.
Comments and strings come from the syntax table; rules earlier in the list win,
so `assumed' after a number stays a keyword rather than a unit.")

(defun syzygy-indent-line ()
  "Indent the current line by the depth of the braces around it."
  (interactive)
  (let* ((depth (save-excursion
                  (back-to-indentation)
                  (let ((d (car (syntax-ppss))))
                    (if (looking-at "[]})]") (max 0 (1- d)) d))))
         (offset (- (current-column) (current-indentation))))
    (indent-line-to (* depth syzygy-indent-offset))
    (when (> offset 0) (forward-char offset))))

;;;###autoload
(define-derived-mode syzygy-mode prog-mode "Syzygy"
  "Major mode for Syzygy system descriptions (`.syz' files)."
  :syntax-table syzygy-mode-syntax-table
  (setq-local comment-start "# ")
  (setq-local comment-start-skip "#+[ \t]*")
  (setq-local comment-end "")
  (setq-local indent-line-function #'syzygy-indent-line)
  (setq-local electric-indent-chars (append '(?}) electric-indent-chars))
  (setq-local font-lock-defaults '(syzygy-font-lock-keywords nil nil)))

;;;###autoload
(add-to-list 'auto-mode-alist '("\\.syz\\'" . syzygy-mode))

(defun syzygy-server-contact (&optional _interactive)
  "The command that starts the language server, checked to exist.
Signals a `user-error' that says what to do when the program is missing."
  (let ((program (car syzygy-server-command)))
    (unless (and program (executable-find program))
      (user-error "The Syzygy language server `%s' was not found; install it with `cargo install --path cli' from a Syzygy checkout, or set `syzygy-server-command'"
                  (or program "")))
    syzygy-server-command))

;;;###autoload
(with-eval-after-load 'eglot
  (add-to-list 'eglot-server-programs '(syzygy-mode . syzygy-server-contact)))

(provide 'syzygy-mode)
;;; syzygy-mode.el ends here
