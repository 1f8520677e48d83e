-- For NeovimEndToEndTest: whether the Neovim set-up takes each path for a match of each glob
-- (input: a JSON list of [glob, path] pairs; output: a JSON list of booleans).
local ok, problem = pcall(function()
  vim.opt.runtimepath:append(vim.env.ESPALIER_NVIM_CONFIG)
  local espalier = require('espalier')
  local cases = vim.fn.json_decode(table.concat(vim.fn.readfile(vim.env.ESPALIER_GLOB_CASES), '\n'))
  local answers = {}
  for _, case in ipairs(cases) do
    local regex = vim.regex(espalier.glob_to_regex(case[1]))
    table.insert(answers, regex:match_str(case[2]) ~= nil)
  end
  vim.fn.writefile({ vim.fn.json_encode(answers) }, vim.env.ESPALIER_RESULT)
end)
if not ok then
  vim.fn.writefile({ vim.fn.json_encode({ error = tostring(problem) }) }, vim.env.ESPALIER_RESULT)
  vim.cmd('cquit! 3')
end
vim.cmd('qall!')
