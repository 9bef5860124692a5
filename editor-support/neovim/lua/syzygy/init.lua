-- Registers the Syzygy language server (`syz lsp`) with Neovim's built-in client for
-- buffers of filetype `syzygy`. Works from Neovim 0.7: `vim.lsp.start` (0.8+) is used
-- where it exists, otherwise one client per project root is started with
-- `vim.lsp.start_client` and attached with `vim.lsp.buf_attach_client`.
--
--   vim.opt.runtimepath:append("/path/to/syzygy/editor-support/neovim")
--   require("syzygy").setup({ cmd = { "syz", "lsp" } })

local M = {}

M.defaults = {
  -- The server command; the first element is looked up on PATH.
  cmd = { "syz", "lsp" },
  -- A folder holding one of these is the project root; else the file's own folder.
  root_markers = { ".git" },
  -- Passed through to the client.
  capabilities = nil,
  on_attach = nil,
  settings = nil,
}

M.config = nil

-- Client ids by root folder, for Neovim versions without `vim.lsp.start`.
local clients_by_root = {}
local warned_missing = false

local uv = vim.loop

local function exists(path)
  return uv.fs_stat(path) ~= nil
end

local function dirname(path)
  local parent = path:match("^(.*)/[^/]*$")
  if parent == nil or parent == "" then
    return "/"
  end
  return parent
end

--- The nearest folder above `file` that holds one of `markers`, else the file's folder.
function M.find_root(file, markers)
  local start = dirname(file)
  local dir = start
  while true do
    for _, marker in ipairs(markers) do
      if exists(dir .. "/" .. marker) then
        return dir
      end
    end
    local parent = dirname(dir)
    if parent == dir then
      return start
    end
    dir = parent
  end
end

--- The message shown when the server program cannot be found, or nil when it can.
function M.missing_server_message(cmd)
  local program = cmd and cmd[1]
  if program == nil or program == "" then
    return "syzygy: no server command configured; pass cmd = { 'syz', 'lsp' } to require('syzygy').setup()"
  end
  if vim.fn.executable(program) == 1 then
    return nil
  end
  return string.format(
    "syzygy: the language server '%s' was not found, so .syz files get highlighting but no checking. "
      .. "Install it with `cargo install --path cli` from a Syzygy checkout, or pass "
      .. "cmd = { '/full/path/to/syz', 'lsp' } to require('syzygy').setup().",
    program
  )
end

local function client_alive(id)
  local client = vim.lsp.get_client_by_id(id)
  return client ~= nil and not (client.is_stopped and client.is_stopped())
end

--- Start (or reuse) the server for buffer `bufnr` and attach it. Returns the client id.
function M.attach(bufnr, config)
  config = config or M.config or M.defaults
  bufnr = (bufnr == nil or bufnr == 0) and vim.api.nvim_get_current_buf() or bufnr

  local missing = M.missing_server_message(config.cmd)
  if missing then
    if not warned_missing then
      warned_missing = true
      vim.notify(missing, vim.log.levels.WARN)
    end
    return nil
  end

  local file = vim.api.nvim_buf_get_name(bufnr)
  local root = file ~= "" and M.find_root(file, config.root_markers) or uv.cwd()
  local client_config = {
    name = "syzygy",
    cmd = config.cmd,
    root_dir = root,
    capabilities = config.capabilities,
    on_attach = config.on_attach,
    settings = config.settings,
  }

  if vim.lsp.start then
    return vim.api.nvim_buf_call(bufnr, function()
      return vim.lsp.start(client_config)
    end)
  end

  local id = clients_by_root[root]
  if id == nil or not client_alive(id) then
    id = vim.lsp.start_client(client_config)
    clients_by_root[root] = id
  end
  if id ~= nil then
    vim.lsp.buf_attach_client(bufnr, id)
  end
  return id
end

--- Register the server for every buffer of filetype `syzygy`, open now or later.
function M.setup(opts)
  -- Shallow on purpose: a `cmd` given replaces the default list, it is not merged into it.
  M.config = vim.tbl_extend("force", {}, M.defaults, opts or {})
  warned_missing = false
  local group = vim.api.nvim_create_augroup("syzygy_lsp", { clear = true })
  vim.api.nvim_create_autocmd("FileType", {
    group = group,
    pattern = "syzygy",
    callback = function(args)
      M.attach(args.buf, M.config)
    end,
  })
  for _, buf in ipairs(vim.api.nvim_list_bufs()) do
    if vim.api.nvim_buf_is_loaded(buf) and vim.bo[buf].filetype == "syzygy" then
      M.attach(buf, M.config)
    end
  end
end

return M
