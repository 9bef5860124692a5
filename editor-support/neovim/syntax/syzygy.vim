" Vim syntax file
" Language:  Syzygy (.syz): stars, planets and their measurements
" Keep the names in step with lang/src/quantities.rs, lexer.rs and units.rs;
" editor-support/check-names.py checks that they are.

if exists("b:current_syntax")
  finish
endif

scriptencoding utf-8

let s:cpo_save = &cpo
set cpo&vim

syn case match

" An identifier as the lexer reads one (the solar and Earth symbols, µ, μ and ω count as letters).
let s:ident = '[A-Za-z_☉⊕°µμω][A-Za-z0-9_☉⊕µμω]*'
let s:num = '\%(\d\+\%(\.\d*\)\=\|\.\d\+\)\%([eE][-+]\=\d\+\)\='
" Quantity names and their trade-symbol aliases, longest first.
let s:qty = '\%('
      \ . 'habitable_inner_optimistic_insolation\|habitable_outer_optimistic_insolation\|absolute_bolometric_magnitude\|habitable_inner_insolation\|habitable_inner_optimistic\|habitable_outer_insolation\|habitable_outer_optimistic\|habitable_zone_position\|predicted_rv_amplitude\|scaled_semi_major_axis\|'
      \ . 'mean_molecular_weight\|transit_duration_full\|bolometric_magnitude\|impact_parameter\|predicted_radius\|transit_duration\|bolometric_flux\|escape_velocity\|habitable_inner\|habitable_outer\|'
      \ . 'right_ascension\|semi_major_axis\|surface_gravity\|arg_periastron\|predicted_mass\|redistribution\|orbital_speed\|spectral_type\|transit_depth\|transit_epoch\|'
      \ . 'eccentricity\|magnitude_ks\|radius_ratio\|rv_amplitude\|scale_height\|bond_albedo\|declination\|hill_radius\|inclination\|magnitude_h\|'
      \ . 'magnitude_j\|magnitude_v\|metallicity\|insolation\|luminosity\|distance\|duration\|min_mass\|parallax\|density\|'
      \ . 'm_sin_i\|albedo\|impact\|period\|r_hill\|radius\|sptype\|M_bol\|Msini\|Rp_Rs\|'
      \ . 'T_eff\|delta\|depth\|epoch\|f_bol\|log_g\|m_bol\|msini\|omega\|rp_rs\|'
      \ . 'v_esc\|v_orb\|K_rv\|T_eq\|Teff\|a_Rs\|a_rs\|dist\|flux\|logg\|'
      \ . 'mass\|teff\|FeH\|SpT\|T14\|T23\|Teq\|age\|dec\|esm\|'
      \ . 'feh\|plx\|rho\|sma\|teq\|tsm\|Mp\|Rp\|T0\|mu\|'
      \ . 'ra\|A\|K\|L\|M\|P\|R\|S\|a\|b\|'
      \ . 'e\|f\|g\|i\|k\|ω'
      \ . '\)'

" Comments, with the silencing form `# allow(rule-id): reason`.
syn match syzygyComment /#.*$/ contains=syzygyAllow,@Spell
syn match syzygyAllow /\%(#\s*\)\@<=allow\s*(\s*[A-Za-z0-9_-]\+\s*)/ contained

syn region syzygyString start=/"/ skip=/\\./ end=/"\|$/ oneline contains=syzygyEscape
syn match syzygyEscape /\\./ contained

syn keyword syzygyKeyword system star planet orbits ref let assumed preferred

" Names declared after a keyword.
exe 'syn match syzygyStarName /\%(\<star\s\+\)\@<=' . s:ident . '/'
exe 'syn match syzygyPlanetName /\%(\<planet\s\+\)\@<=' . s:ident . '/'
exe 'syn match syzygyBodyRef /\%(\<orbits\s\+\)\@<=' . s:ident . '/'
exe 'syn match syzygyRefId /\%(\<ref\s\+\)\@<=' . s:ident . '/'
exe 'syn match syzygyLetName /\%(\<let\s\+\)\@<=' . s:ident . '/'

" A property: a quantity name at the start of a line or after `{` or `;`.
exe 'syn match syzygyProperty /\%(\%(^\|[{;]\)\s*\)\@<=' . s:ident . '\ze\s*[=<>]/'
exe 'syn match syzygyQuantity /\%(\%(^\|[{;]\)\s*\)\@<=\<' . s:qty . '\>\ze\s*[=<>]/'
" A reference to another body's quantity: `b.period`, `veyra.mass`.
exe 'syn match syzygyBodyRef /' . s:ident . '\ze\s*\.\s*[A-Za-z_]/'
exe 'syn match syzygyQuantity /\%(\.\s*\)\@<=\<' . s:qty . '\>/'

syn match syzygyFunction /\<\%(sqrt\|cbrt\|exp\|ln\|log10\|sin\|cos\|tan\|abs\)\ze\s*(/
syn match syzygyConstant /\<\%(pi\|G\|c\|sigma_sb\)\>\%(\s*\.\)\@!/

" Numbers, uncertainties and limits.
exe 'syn match syzygyNumber /\%([A-Za-z0-9_.☉⊕µμω]\)\@<!' . s:num . '/'
syn match syzygyUncertainty /±\|+-/
exe 'syn match syzygyUncertainty /\%(\d\s*\)\@<=+\ze\s*' . s:num . '\s*\/\s*[-−]/'
exe 'syn match syzygyUncertainty /\%(\%(\d\s*\)\@<=+\s*' . s:num . '\s*\)\@<=\/\s*[-−]/'
syn match syzygyLimit /[<>]/

" A unit follows a number (or its uncertainty): `Msun`, `m/s`, `km s^-1`, `g/cm^3`, `%`.
let s:factor = '\%(\%(\<\%(assumed\|preferred\|system\|star\|planet\|orbits\|ref\|let\)\>\)\@!' . s:ident . '\|%\)\%(\s*\^\s*[-−]\=\s*\d\+\)\='
exe 'syn match syzygyUnit /\%(\d\s*\)\@<=' . s:factor . '\%(\s*\/\s*' . s:factor . '\|\s\+' . s:factor . '\)*/ contains=syzygyUnitOperator'
syn match syzygyUnitOperator /[\/^]\|[-−]\=\d\+/ contained

" Citations: `[rv1]`, `[rv1, ph1]`.
exe 'syn region syzygyCitation matchgroup=syzygyCitationBracket start=/\[/ end=/\]\|$/ oneline contains=syzygyCitationId'
exe 'syn match syzygyCitationId /' . s:ident . '/ contained'

hi def link syzygyComment         Comment
hi def link syzygyAllow           PreProc
hi def link syzygyString          String
hi def link syzygyEscape          SpecialChar
hi def link syzygyKeyword         Keyword
hi def link syzygyStarName        Type
hi def link syzygyPlanetName      Type
hi def link syzygyBodyRef         Type
hi def link syzygyRefId           Label
hi def link syzygyLetName         Identifier
hi def link syzygyProperty        Normal
hi def link syzygyQuantity        Identifier
hi def link syzygyFunction        Function
hi def link syzygyConstant        Constant
hi def link syzygyNumber          Number
hi def link syzygyUncertainty     Operator
hi def link syzygyLimit           Operator
hi def link syzygyUnit            Special
hi def link syzygyUnitOperator    Special
hi def link syzygyCitation        Label
hi def link syzygyCitationBracket Delimiter
hi def link syzygyCitationId      Label

let b:current_syntax = "syzygy"

let &cpo = s:cpo_save
unlet s:cpo_save
