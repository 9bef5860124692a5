-- The set-up a user would write in init.lua, with the plugin folder found relative to
-- this file so the test runs from any checkout.
local here = debug.getinfo(1, "S").source:sub(2)
local plugin = vim.fn.fnamemodify(here, ":p:h:h")

vim.opt.runtimepath:prepend(plugin)
vim.opt.swapfile = false
vim.opt.shadafile = "NONE"
vim.cmd("filetype plugin indent on")
vim.cmd("syntax on")

require("syzygy").setup()
