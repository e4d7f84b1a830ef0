"""The Basic module of wrappers Calc calls: one Basic function per cell function.

Calc finds a function that is not its own among the Basic functions of the profile's Standard
library (the only library it searches when it imports a workbook). Each wrapper hands its
arguments to the Python bridge and returns what comes back: a value, or a 2-D array that Calc
spreads over the cells of an array formula. Every wrapper traps every error and returns a
readable ``⚠`` message: an error that escapes into Calc leaves a headless LibreOffice waiting
for ever on a dialog nobody sees.
"""

from __future__ import annotations

from collections.abc import Iterable

from ._names import BASIC_MODULE, BRIDGE_FILE, BRIDGE_FUNCTION, SETUP_COMMAND, UNDO_COMMAND
from ._specs import HostArgument, HostFunction

__all__ = ["basic_source", "basic_module_xml", "MARKER"]

# The first line of the module: how setup recognises a module it wrote itself.
MARKER = "REM twistshare cell functions for LibreOffice Calc"

# Words Basic reserves or defines at module level; a parameter named like one gets a prefix.
_BASIC_WORDS = frozenset(w.casefold() for w in """
    Access Alias And Any Append As Base Binary Boolean ByRef ByVal Call Case CBool CByte CDate CDbl
    CInt CLng Close Compatible Const CSng CStr Currency Date Declare DefBool DefDate DefDbl DefInt
    DefLng DefObj DefStr DefVar Dim Do Double Each Else ElseIf Empty End Enum Eqv Erase Err Error
    Exit Explicit False For Function Get Global GoSub GoTo If Imp Implements In Input Integer Is
    Let Lib Like Line Lock Long Loop LSet Me Mid Mod Name New Next Not Nothing Null Object On Open
    Option Optional Or Output ParamArray Preserve Print Private Property Public Put Random Read
    ReDim Rem Resume Return RSet Seek Select Set Shared Single Static Step Stop String Sub Then
    Time To True Type TypeOf Until Variant VBASupport Wend While With Write Xor
""".split())

_SCRIPT_URI = f"vnd.sun.star.script:{BRIDGE_FILE}${BRIDGE_FUNCTION}?language=Python&location=user"

_HELPERS = f'''Option Explicit

Private twsScript As Object

Private Function TwsFailure(sName As String, nErr As Long, sErr As String, nLine As Long, sHint As String) As String
    On Error Resume Next
    TwsFailure = Chr(9888) & " " & sName & " could not run in LibreOffice: " & sErr & " (Basic error " _
        & nErr & ", line " & nLine & ")" & sHint
End Function

REM A result of several values comes from Python as rows of values; Calc takes a 2-D array.
Private Function TwsCells(vResult As Variant) As Variant
    Dim aCells(), vRow As Variant, nRows As Long, nCols As Long, i As Long, j As Long
    If Not IsArray(vResult) Then
        TwsCells = vResult
        Exit Function
    End If
    nRows = UBound(vResult) - LBound(vResult) + 1
    If nRows < 1 Then
        TwsCells = ""
        Exit Function
    End If
    nCols = 1
    For i = LBound(vResult) To UBound(vResult)
        vRow = vResult(i)
        If IsArray(vRow) Then
            If UBound(vRow) - LBound(vRow) + 1 > nCols Then nCols = UBound(vRow) - LBound(vRow) + 1
        End If
    Next i
    ReDim aCells(0 To nRows - 1, 0 To nCols - 1)
    For i = 0 To nRows - 1
        vRow = vResult(LBound(vResult) + i)
        For j = 0 To nCols - 1
            aCells(i, j) = ""
        Next j
        If IsArray(vRow) Then
            For j = 0 To UBound(vRow) - LBound(vRow)
                aCells(i, j) = vRow(LBound(vRow) + j)
            Next j
        Else
            aCells(i, 0) = vRow
        End If
    Next i
    TwsCells = aCells
End Function

Private Function TwsCall(sName As String, aArgs As Variant) As Variant
    Dim aOutIndex(), aOut(), sHint As String, oFactory As Object, vResult As Variant
    On Error GoTo Failed
    sHint = ""
    If IsNull(twsScript) Then
        sHint = "; LibreOffice could not load the twistshare bridge (Scripts/python/{BRIDGE_FILE} in your " _
            & "profile): is its Python scripting installed (Debian, Ubuntu: libreoffice-script-provider-python)? " _
            & "Then run {SETUP_COMMAND} again"
        oFactory = createUnoService("com.sun.star.script.provider.MasterScriptProviderFactory")
        twsScript = oFactory.createScriptProvider("").getScript("{_SCRIPT_URI}")
        sHint = ""
    End If
    vResult = twsScript.invoke(Array(sName, aArgs), aOutIndex, aOut)
    If IsArray(vResult) Then vResult = TwsCells(vResult)
    TwsCall = vResult
    Exit Function
Failed:
    TwsCall = TwsFailure(sName, Err, Error$, Erl, sHint)
End Function
'''


def _basic_name(argument: HostArgument) -> str:
    return f"a_{argument.name}" if argument.name.casefold() in _BASIC_WORDS else argument.name


def _one_line(text: str) -> str:
    return " ".join(str(text).split())


def _wrapper(spec: HostFunction) -> str:
    names = [_basic_name(a) for a in spec.arguments]
    lines = [f"REM {spec.name}({', '.join(a.name for a in spec.arguments)})",
             f"REM   {_one_line(spec.description)}"]
    for a in spec.arguments:
        unit = f" [{_one_line(a.unit)}]" if a.unit else ""
        lines.append(f"REM   {a.name}{' (optional)' if a.optional else ''}{unit}: {_one_line(a.description)}")
    # Every parameter is Optional: a required one left out then reaches the engine as empty and
    # gets the engine's own message, instead of a Basic error.
    params = ", ".join(f"Optional {n}" for n in names)
    lines.append(f"Function {spec.name}({params})")
    if names:
        lines.append(f"    Dim aArgs({len(names) - 1})")
    else:
        lines.append("    Dim aArgs()")
    lines.append("    On Error GoTo Failed")
    for i, n in enumerate(names):
        lines.append(f"    If Not IsMissing({n}) Then aArgs({i}) = {n}")
    lines += [f'    {spec.name} = TwsCall("{spec.name}", aArgs)',
              "    Exit Function",
              "Failed:",
              f'    {spec.name} = TwsFailure("{spec.name}", Err, Error$, Erl, "")',
              "End Function"]
    return "\n".join(lines)


def basic_source(specs: Iterable[HostFunction]) -> str:
    """The Basic code of the wrapper module, one function per cell function."""
    head = "\n".join([
        MARKER,
        f"REM Written by `{SETUP_COMMAND}`, which rewrites it; `{UNDO_COMMAND}` removes it.",
        "REM Do not edit: changes here are lost at the next setup. Each function hands its arguments",
        f"REM to the Python bridge (Scripts/python/{BRIDGE_FILE}) and returns its answer.",
    ])
    return head + "\n" + _HELPERS + "\n" + "\n\n".join(_wrapper(s) for s in specs) + "\n"


def _xml_text(text: str) -> str:
    return text.replace("&", "&amp;").replace("<", "&lt;").replace(">", "&gt;").replace('"', "&quot;")


def basic_module_xml(specs: Iterable[HostFunction]) -> str:
    """The module as LibreOffice stores it in a library folder (``TwistshareCells.xba``)."""
    return ('<?xml version="1.0" encoding="UTF-8"?>\n'
            '<!DOCTYPE script:module PUBLIC "-//OpenOffice.org//DTD OfficeDocument 1.0//EN" "module.dtd">\n'
            f'<script:module xmlns:script="http://openoffice.org/2000/script" script:name="{BASIC_MODULE}" '
            'script:language="StarBasic" script:moduleType="normal">'
            + _xml_text(basic_source(specs)) + "</script:module>\n")
