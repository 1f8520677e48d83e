-- Drives headless Neovim as the language client for NeovimEndToEndTest: loads the editor set-up of
-- editor-samples/neovim, opens a grammar and a sample file, waits for their diagnostics, asks for a
-- completion list in each and for espalier/allowedTokens in the sample, and writes what the editor
-- received to a JSON file. Every input comes from environment variables (see the test).
local env = vim.env
local uv = vim.uv or vim.loop
local started = uv.now()
local result = { millis = {} }
result.nvim = tostring(vim.version().major) .. '.' .. vim.version().minor .. '.' .. vim.version().patch
local deadline = uv.now() + tonumber(env.ESPALIER_TIMEOUT_MS)

local function remaining()
  return math.max(0, deadline - uv.now())
end

local function mark(what)
  result.millis[what] = uv.now() - started
end

local function finish(code)
  vim.fn.writefile({ vim.fn.json_encode(result) }, env.ESPALIER_RESULT)
  vim.cmd((code == 0 and 'qall!') or 'cquit! ' .. code)
end

local function position(spec)
  local line, character = spec:match('^(%d+),(%d+)$')
  return { line = tonumber(line), character = tonumber(character) }
end

-- the raw LSP diagnostics as the server published them, by URI
local published = {}
local publish = vim.lsp.handlers['textDocument/publishDiagnostics']
vim.lsp.handlers['textDocument/publishDiagnostics'] = function(err, params, ctx, config)
  if params and params.uri then
    published[params.uri] = params.diagnostics
  end
  return publish(err, params, ctx, config)
end

local function open(path)
  vim.cmd('edit ' .. vim.fn.fnameescape(path))
  local bufnr = vim.api.nvim_get_current_buf()
  local attached = vim.wait(remaining(), function()
    local clients = vim.lsp.get_clients and vim.lsp.get_clients({ bufnr = bufnr }) or vim.lsp.buf_get_clients(bufnr)
    return next(clients) ~= nil
  end, 20)
  assert(attached, 'no language client attached to ' .. path)
  return bufnr, vim.uri_from_bufnr(bufnr)
end

-- waits for a non-empty publication whose diagnostics are final (a sample's first note may only say
-- that its preview is being prepared)
local function wait_diagnostics(uri, bufnr)
  local got = vim.wait(remaining(), function()
    local list = published[uri]
    if list == nil or #list == 0 or #vim.diagnostic.get(bufnr) == 0 then
      return false
    end
    for _, d in ipairs(list) do
      if d.code == 'preview-preparing' then
        return false
      end
    end
    return true
  end, 20)
  assert(got, 'no diagnostics for ' .. uri)
  return published[uri], #vim.diagnostic.get(bufnr)
end

-- one request through the attached client; retried while the answer is empty or an error (a
-- sample's preview is prepared in the background after the file opens)
local function request(bufnr, method, params, usable)
  local last
  while remaining() > 0 do
    local responses = vim.lsp.buf_request_sync(bufnr, method, params, remaining())
    for _, response in pairs(responses or {}) do
      last = response
      if response.error == nil and usable(response.result) then
        return response.result
      end
    end
    vim.wait(100)
  end
  error(method .. ' gave no usable answer; last: ' .. vim.inspect(last))
end

local function completion_items(r)
  if r == nil then
    return nil
  end
  return r.items or r
end

local ok, problem = pcall(function()
  vim.cmd('filetype on')
  vim.opt.runtimepath:append(env.ESPALIER_NVIM_CONFIG)
  require('espalier').setup({ cmd = vim.fn.json_decode(env.ESPALIER_SERVER_CMD), debounce = 50 })

  local grammar, grammar_uri = open(env.ESPALIER_GRAMMAR)
  result.grammar = { filetype = vim.bo[grammar].filetype, uri = grammar_uri }
  result.grammar.diagnostics, result.grammar.shown = wait_diagnostics(grammar_uri, grammar)
  mark('grammarDiagnostics')
  local items = completion_items(request(grammar, 'textDocument/completion', {
    textDocument = { uri = grammar_uri }, position = position(env.ESPALIER_GRAMMAR_POS),
  }, function(r)
    local list = completion_items(r)
    return list ~= nil and #list > 0
  end))
  result.grammar.completion = {}
  for _, item in ipairs(items) do
    table.insert(result.grammar.completion, item.label)
  end

  local sample, sample_uri = open(env.ESPALIER_SAMPLE)
  result.sample = { filetype = vim.bo[sample].filetype, uri = sample_uri }
  result.sample.diagnostics, result.sample.shown = wait_diagnostics(sample_uri, sample)
  mark('sampleDiagnostics')
  local at = position(env.ESPALIER_SAMPLE_POS)
  local list = request(sample, 'textDocument/completion', { textDocument = { uri = sample_uri }, position = at },
    function(r)
      local l = completion_items(r)
      return l ~= nil and #l > 0
    end)
  result.sample.completion = {}
  for _, item in ipairs(completion_items(list)) do
    local edit = item.textEdit
    table.insert(result.sample.completion, {
      label = item.label,
      data = item.data,
      newText = edit and edit.newText,
    })
  end
  result.sample.allowed = request(sample, 'espalier/allowedTokens',
    { uri = sample_uri, position = at, limit = 100000 }, function(r)
      return r ~= nil and r ~= vim.NIL
    end)
end)

mark('done')
if not ok then
  result.error = tostring(problem)
  finish(3)
else
  finish(0)
end
