-- End-to-end test of the Neovim set-up with the real `syz lsp`. Run from test.sh as
--   nvim --headless -u test/minimal_init.lua -c "luafile test/e2e.lua"
-- Opens a copy of an example with one deliberate unit mistake, checks filetype and
-- highlighting, waits for the server's diagnostics, and asks for hover and inlay hints.
-- Prints one line per check and exits non-zero when any fails.

local here = debug.getinfo(1, "S").source:sub(2)
local support = vim.fn.fnamemodify(here, ":p:h:h:h")
local fixture = support .. "/fixtures/veyra-unit-error.syz"
local timeout_ms = tonumber(os.getenv("SYZYGY_TEST_TIMEOUT_MS") or "") or 30000

local passed, failed = 0, 0

local function say(line)
  io.stdout:write(line .. "\n")
  io.stdout:flush()
end

local function check(name, ok, detail)
  if ok then
    passed = passed + 1
    say("  ok   " .. name)
  else
    failed = failed + 1
    say("  FAIL " .. name .. (detail and (": " .. tostring(detail)) or ""))
  end
  return ok
end

-- Zero-based line and UTF-16 column of the nth occurrence of `text`, searched line by line.
local function position_of(bufnr, text, nth)
  nth = nth or 1
  local lines = vim.api.nvim_buf_get_lines(bufnr, 0, -1, false)
  local seen = 0
  for i, line in ipairs(lines) do
    local from = 1
    while true do
      local s = line:find(text, from, true)
      if s == nil then
        break
      end
      seen = seen + 1
      if seen == nth then
        return { line = i - 1, character = vim.str_utfindex(line, s - 1), byte = s - 1 }
      end
      from = s + 1
    end
  end
  error("text not found in the buffer: " .. text)
end

local function syntax_at(bufnr, text, nth)
  local p = position_of(bufnr, text, nth)
  return vim.fn.synIDattr(vim.fn.synID(p.line + 1, p.byte + 1, 1), "name")
end

local function clients_of(bufnr)
  if vim.lsp.get_clients then
    return vim.lsp.get_clients({ bufnr = bufnr })
  end
  local out = {}
  for _, c in pairs(vim.lsp.buf_get_clients(bufnr)) do
    table.insert(out, c)
  end
  return out
end

-- Send a request through the client and wait for its answer.
local function request(client, method, params, bufnr)
  local done, answer, failure = false, nil, nil
  client.request(method, params, function(err, result)
    failure, answer, done = err, result, true
  end, bufnr)
  vim.wait(timeout_ms, function()
    return done
  end, 20)
  if not done then
    return nil, method .. ": no answer within " .. timeout_ms .. " ms"
  end
  if failure then
    return nil, method .. ": " .. vim.inspect(failure)
  end
  return answer, nil
end

local function markup_text(contents)
  if type(contents) == "string" then
    return contents
  end
  if contents.value then
    return contents.value
  end
  local parts = {}
  for _, c in ipairs(contents) do
    table.insert(parts, type(c) == "string" and c or c.value)
  end
  return table.concat(parts, "\n")
end

local function hint_label(hint)
  if type(hint.label) == "string" then
    return hint.label
  end
  local parts = {}
  for _, p in ipairs(hint.label) do
    table.insert(parts, p.value)
  end
  return table.concat(parts)
end

-- The CLI's own value of planet b's density, to compare the editor's against.
local function cli_density()
  local out = vim.fn.system({ "syz", "eval", "--format", "json", fixture })
  local ok, doc = pcall(vim.fn.json_decode, out)
  if not ok or type(doc) ~= "table" then
    return nil
  end
  for _, sys in ipairs(doc.systems or {}) do
    for _, body in ipairs(sys.bodies or {}) do
      if body.id == "b" and body.quantities and body.quantities.density then
        return body.quantities.density.value, body.quantities.density.unit
      end
    end
  end
  return nil
end

local function run()
  say("neovim " .. tostring(vim.version().major) .. "." .. tostring(vim.version().minor) .. "." .. tostring(vim.version().patch))
  vim.cmd("edit " .. vim.fn.fnameescape(fixture))
  local bufnr = vim.api.nvim_get_current_buf()

  check("filetype is syzygy", vim.bo[bufnr].filetype == "syzygy", vim.bo[bufnr].filetype)
  check("comment string is '# %s'", vim.bo[bufnr].commentstring == "# %s", vim.bo[bufnr].commentstring)
  local expect_syntax = {
    { "# A copy", 1, "syzygyComment" },
    { "ref", 1, "syzygyKeyword" },
    { "rv1", 1, "syzygyRefId" },
    { "veyra", 2, "syzygyStarName" },
    { "mass", 1, "syzygyQuantity" },
    { "0.93", 1, "syzygyNumber" },
    { "±", 1, "syzygyUncertainty" },
    { "Msun", 1, "syzygyUnit" },
    { "rv1]", 1, "syzygyCitationId" },
    { "+0.03", 1, "syzygyUncertainty" },
    { "K0V", 1, "syzygyString" },
    { "b orbits", 1, "syzygyPlanetName" },
    { "< 0.08", 1, "syzygyLimit" },
    { "assumed", 1, "syzygyKeyword" },
    { "m/s      [rv1]", 1, "syzygyUnit" },
  }
  for _, e in ipairs(expect_syntax) do
    local got = syntax_at(bufnr, e[1], e[2])
    check(string.format("'%s' is highlighted as %s", e[1], e[3]), got == e[3], got)
  end

  local attached = vim.wait(timeout_ms, function()
    return #clients_of(bufnr) > 0
  end, 20)
  if not check("syz lsp attached to the buffer", attached) then
    return
  end
  local client = clients_of(bufnr)[1]
  check("the client is called syzygy", client.name == "syzygy", client.name)

  -- Diagnostics: exactly one error, the deliberate unit mistake.
  local mistake = position_of(bufnr, "period       = 3.5 m/s")
  local got_diags = vim.wait(timeout_ms, function()
    return #vim.diagnostic.get(bufnr) > 0
  end, 20)
  check("the server published diagnostics", got_diags)
  local errors = vim.diagnostic.get(bufnr, { severity = vim.diagnostic.severity.ERROR })
  check("exactly one error", #errors == 1, vim.inspect(errors))
  local unit_error = nil
  for _, d in ipairs(errors) do
    local code = d.code or (d.user_data and d.user_data.lsp and d.user_data.lsp.code)
    if code == "unit-mismatch" then
      unit_error = d
    end
  end
  if check("a unit-mismatch error is reported", unit_error ~= nil, vim.inspect(errors)) then
    check("... on the line of the mistake", unit_error.lnum == mistake.line,
      string.format("line %d, expected %d", unit_error.lnum, mistake.line))
    check("... from source syzygy", unit_error.source == "syzygy", unit_error.source)
    check("... saying a period is a time", unit_error.message:find("time", 1, true) ~= nil, unit_error.message)
  end

  -- Hover on planet b's name: its table of quantities, with the derived density.
  local uri = vim.uri_from_bufnr(bufnr)
  local b = position_of(bufnr, "b orbits")
  local hover, herr = request(client, "textDocument/hover", {
    textDocument = { uri = uri },
    position = { line = b.line, character = b.character },
  }, bufnr)
  if check("hover on planet b answers", hover ~= nil and hover.contents ~= nil, herr or vim.inspect(hover)) then
    local text = markup_text(hover.contents)
    check("hover lists b's density as derived",
      text:find("|%s*density%s*|[^|\n]*g/cm%^3[^|\n]*|%s*derived") ~= nil, text)
  end

  -- Inlay hints (sent raw: Neovim 0.7 has no inlay-hint API).
  local last = vim.api.nvim_buf_line_count(bufnr)
  local hints, ierr = request(client, "textDocument/inlayHint", {
    textDocument = { uri = uri },
    range = { start = { line = 0, character = 0 }, ["end"] = { line = last, character = 0 } },
  }, bufnr)
  if check("inlay hints answer", type(hints) == "table" and #hints > 0, ierr or vim.inspect(hints)) then
    local density_hint = nil
    for _, h in ipairs(hints) do
      if h.position.line == b.line and hint_label(h):find("ρ = ", 1, true) then
        density_hint = hint_label(h)
      end
    end
    if check("an inlay hint on planet b's line shows the derived density", density_hint ~= nil,
        vim.inspect(hints)) then
      local shown = tonumber(density_hint:match("ρ = ([%d.]+)"))
      local expected, unit = cli_density()
      check("... in g/cm^3", density_hint:find("ρ = [%d.]+[^·]*g/cm%^3") ~= nil, density_hint)
      check("... agreeing with `syz eval` to 5%",
        shown ~= nil and expected ~= nil and unit == "g/cm^3" and math.abs(shown - expected) <= 0.05 * expected,
        string.format("hint %s, syz eval %s %s", tostring(shown), tostring(expected), tostring(unit)))
    end
  end

  -- A missing server gets a message that says what to do.
  local syzygy = require("syzygy")
  local notes = {}
  local notify = vim.notify
  vim.notify = function(msg)
    table.insert(notes, msg)
  end
  vim.cmd("enew")
  local missing_id = syzygy.attach(0, { cmd = { "syz-not-installed-here", "lsp" }, root_markers = { ".git" } })
  vim.notify = notify
  check("a missing server starts no client", missing_id == nil)
  check("... and says how to install it",
    #notes == 1 and notes[1]:find("'syz-not-installed-here' was not found", 1, true) ~= nil
      and notes[1]:find("cargo install", 1, true) ~= nil, vim.inspect(notes))

  -- The server shuts down when asked.
  vim.lsp.stop_client(client.id)
  local stopped = vim.wait(timeout_ms, function()
    return client.is_stopped()
  end, 20)
  check("the server stops on shutdown", stopped)
end

local ok, err = xpcall(run, debug.traceback)
if not ok then
  check("the test ran to the end", false, err)
end
say(string.format("neovim: %d checks ok, %d failing", passed, failed))
if failed > 0 then
  vim.cmd("cquit")
else
  vim.cmd("qall!")
end
