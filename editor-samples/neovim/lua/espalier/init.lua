-- The espalier language server in Neovim's built-in LSP client (no plugins needed).
-- Works on Neovim 0.7.2 and newer: uses vim.lsp.start where it exists (0.10+), vim.lsp.start_client
-- with one client per root folder before that.
--
--   vim.opt.runtimepath:append('/path/to/espalier/editor-samples/neovim')
--   require('espalier').setup({ cmd = { '/path/to/espalier/espalier', 'serve' } })
--
-- .abnf files get the filetype "abnf"; files mapped by the nearest espalier-samples.json (its
-- "files" globs) keep their own filetype plus "espaliersample" (e.g. "json.espaliersample", or
-- just "espaliersample" for text), and are handed to the server, which previews the allowed tokens.
local M = {}

local SAMPLE_MAP = 'espalier-samples.json'

M.config = {
  -- program and arguments that run the server: the repository's launcher or the jar
  cmd = { 'espalier', 'serve' },
  -- milliseconds after the last change before a document is checked (passed as --debounce)
  debounce = 200,
  -- called with (client, bufnr) when a buffer is attached
  on_attach = nil,
  -- client capabilities (nil: Neovim's defaults)
  capabilities = nil,
  -- set 'omnifunc' so that <C-x><C-o> asks the server
  omnifunc = true,
}

local clients = {} -- root folder -> client id (Neovim < 0.10)

local function uv()
  return vim.uv or vim.loop
end

local function exists(path)
  return uv().fs_stat(path) ~= nil
end

local function dirname(path)
  return vim.fn.fnamemodify(path, ':h')
end

--- The nearest espalier-samples.json in the folder of `path` or above, or nil.
function M.find_sample_map(path)
  local dir = dirname(path)
  while true do
    local candidate = dir .. '/' .. SAMPLE_MAP
    if exists(candidate) then
      return candidate
    end
    local parent = dirname(dir)
    if parent == dir then
      return nil
    end
    dir = parent
  end
end

--- A Vim regular expression (very magic) for a glob, read as the server reads the globs of
--- espalier-samples.json (java.nio's glob syntax): * and ? stay inside one folder, ** crosses
--- folders, {a,b} is a choice, [...] a class ([!...] negated).
function M.glob_to_regex(glob)
  local out = { '\\v^' }
  local i, n, depth = 1, #glob, 0
  while i <= n do
    local c = glob:sub(i, i)
    if c == '*' then
      if glob:sub(i + 1, i + 1) == '*' then
        table.insert(out, '.*')
        i = i + 1
      else
        table.insert(out, '[^/]*')
      end
    elseif c == '?' then
      table.insert(out, '[^/]')
    elseif c == '{' then
      table.insert(out, '%(')
      depth = depth + 1
    elseif c == '}' and depth > 0 then
      table.insert(out, ')')
      depth = depth - 1
    elseif c == ',' and depth > 0 then
      table.insert(out, '|')
    elseif c == '[' then
      local close = glob:find(']', i + 1, true)
      if close then
        local class = glob:sub(i + 1, close - 1):gsub('^!', '^'):gsub('\\', '\\\\')
        table.insert(out, '[' .. class .. ']')
        i = close
      else
        table.insert(out, '\\[')
      end
    elseif c:match('[%w_/-]') then
      table.insert(out, c)
    else
      table.insert(out, '\\' .. c)
    end
    i = i + 1
  end
  table.insert(out, '$')
  return table.concat(out)
end

local function read_json(path)
  local ok, lines = pcall(vim.fn.readfile, path)
  if not ok then
    return nil
  end
  local decoded
  ok, decoded = pcall(vim.fn.json_decode, table.concat(lines, '\n'))
  if ok and type(decoded) == 'table' then
    return decoded
  end
  return nil
end

--- Whether the nearest espalier-samples.json maps the file at `path` (an absolute path).
function M.is_sample(path)
  local map_file = M.find_sample_map(path)
  if not map_file then
    return false
  end
  local map = read_json(map_file)
  if not map or type(map.samples) ~= 'table' then
    return false
  end
  local base = dirname(map_file)
  local relative = path:sub(#base + 2)
  for _, entry in ipairs(map.samples) do
    local files = type(entry) == 'table' and entry.files or nil
    if type(files) == 'string' then
      files = { files }
    end
    if type(files) == 'table' then
      for _, glob in ipairs(files) do
        if type(glob) == 'string' then
          local ok, regex = pcall(vim.regex, M.glob_to_regex(glob))
          if ok and regex:match_str(relative) then
            return true
          end
        end
      end
    end
  end
  return false
end

--- The root folder for a file: the folder of the nearest espalier-samples.json, else of the nearest
--- .git, else the file's own folder.
function M.root_dir(path)
  local map_file = M.find_sample_map(path)
  if map_file then
    return dirname(map_file)
  end
  local git = vim.fn.finddir('.git', dirname(path) .. ';')
  if git ~= '' then
    return vim.fn.fnamemodify(git, ':p:h:h')
  end
  return dirname(path)
end

local function client_config(root)
  local cmd = vim.list_extend(vim.deepcopy(M.config.cmd), { '--debounce', tostring(M.config.debounce) })
  return {
    name = 'espalier',
    cmd = cmd,
    root_dir = root,
    capabilities = M.config.capabilities or vim.lsp.protocol.make_client_capabilities(),
    on_attach = function(client, bufnr)
      if M.config.omnifunc then
        vim.bo[bufnr].omnifunc = 'v:lua.vim.lsp.omnifunc'
      end
      if M.config.on_attach then
        M.config.on_attach(client, bufnr)
      end
    end,
  }
end

--- Attaches the server to a buffer (starting it for the buffer's root folder when needed).
function M.attach(bufnr)
  bufnr = (bufnr == nil or bufnr == 0) and vim.api.nvim_get_current_buf() or bufnr
  local path = vim.api.nvim_buf_get_name(bufnr)
  if path == '' then
    return nil
  end
  local root = M.root_dir(vim.fn.fnamemodify(path, ':p'))
  if vim.fn.has('nvim-0.10') == 1 then
    return vim.lsp.start(client_config(root), { bufnr = bufnr })
  end
  local id = clients[root]
  local client = id and vim.lsp.get_client_by_id(id)
  if not client or client.is_stopped() then
    id = vim.lsp.start_client(client_config(root))
    if not id then
      vim.notify('espalier: could not start ' .. table.concat(M.config.cmd, ' '), vim.log.levels.ERROR)
      return nil
    end
    clients[root] = id
  end
  vim.lsp.buf_attach_client(bufnr, id)
  return id
end

local function mark_sample(bufnr)
  local path = vim.api.nvim_buf_get_name(bufnr)
  if path == '' then
    return
  end
  path = vim.fn.fnamemodify(path, ':p')
  if vim.fn.fnamemodify(path, ':t') == SAMPLE_MAP then
    M.attach(bufnr) -- the workspace file gets diagnostics of its own
    return
  end
  if not M.is_sample(path) then
    return
  end
  local ft = vim.bo[bufnr].filetype
  if not ft:match('espaliersample') then
    vim.bo[bufnr].filetype = ft == '' and 'espaliersample' or (ft .. '.espaliersample')
  end
  M.attach(bufnr)
end

--- Asks the server for the allowed tokens at the cursor (espalier/allowedTokens) and shows them.
function M.show_allowed_tokens(limit)
  local bufnr = vim.api.nvim_get_current_buf()
  local params
  if vim.fn.has('nvim-0.11') == 1 then
    params = vim.lsp.util.make_position_params(0, 'utf-16')
  else
    params = vim.lsp.util.make_position_params()
  end
  params = { uri = params.textDocument.uri, position = params.position, limit = limit or 40 }
  vim.lsp.buf_request(bufnr, 'espalier/allowedTokens', params, function(err, result)
    if err then
      vim.notify('espalier: ' .. (err.message or vim.inspect(err)), vim.log.levels.WARN)
      return
    end
    if not result then
      return
    end
    local lines = {
      string.format('%d of %d tokens allowed%s', result.count, result.vocabularySize,
        result.endAllowed and ', the output may end here' or ''),
    }
    if result.forced ~= '' then
      table.insert(lines, 'forced: ' .. result.forced)
    end
    for _, t in ipairs(result.tokens) do
      table.insert(lines, string.format('%7d  %s', t.id, t.text))
    end
    vim.lsp.util.open_floating_preview(lines, 'text', { border = 'single' })
  end)
end

function M.setup(opts)
  M.config = vim.tbl_deep_extend('force', M.config, opts or {})
  local group = vim.api.nvim_create_augroup('espalier', { clear = true })
  vim.api.nvim_create_autocmd({ 'BufRead', 'BufNewFile' }, {
    group = group,
    pattern = '*.abnf',
    callback = function(args)
      vim.bo[args.buf].filetype = 'abnf'
    end,
  })
  vim.api.nvim_create_autocmd('FileType', {
    group = group,
    pattern = 'abnf',
    callback = function(args)
      M.attach(args.buf)
    end,
  })
  vim.api.nvim_create_autocmd({ 'BufRead', 'BufNewFile' }, {
    group = group,
    pattern = '*',
    callback = function(args)
      -- after the other BufRead handlers: filetype detection may come later in the list
      vim.schedule(function()
        if vim.api.nvim_buf_is_valid(args.buf) and vim.bo[args.buf].buftype == '' then
          mark_sample(args.buf)
        end
      end)
    end,
  })
  vim.api.nvim_create_user_command('EspalierAllowedTokens', function(c)
    M.show_allowed_tokens(tonumber(c.args))
  end, { nargs = '?', desc = 'Show the tokens the constraint allows at the cursor' })
end

return M
