" Syzygy system descriptions
autocmd BufRead,BufNewFile *.syz setfiletype syzygy
