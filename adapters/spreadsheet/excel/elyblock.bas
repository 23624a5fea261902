Attribute VB_Name = "elyblock"
' elyblock worksheet functions for Excel: ELYSOLVE, ELYOUTPUTS, ELYPROFILE, ELYSUMMARY, ELYVARIABLES,
' ELYVERSION, ELYMESSAGE.
'
' The same functions, with the same arguments, as the elyblock add-in of LibreOffice Calc (one
' table, adapters/spreadsheet/functions.json). They call elyblock.dll, the library's 64-bit
' Windows build (scripts/windows), through its public C interface (elyblock/elyblock.h).
'
' Install (64-bit Excel 2010 or later, Windows):
'   1. Put elyblock.dll beside the workbook (or set ElyblockDllFolder, below, to its folder).
'   2. In the workbook: Alt+F11 (the VBA editor), File > Import File..., choose elyblock.bas.
'      Save the workbook as .xlsm (macro-enabled), or as an add-in (.xlam) to use the functions
'      in every workbook (then put the DLL beside the add-in).
'   3. Optional: run ElyblockRegister once (Alt+F8) for the argument descriptions of the Insert
'      Function dialog (category elyblock).
'   Then: =ELYSOLVE(A2:B23, "product.hydrogen [kg/h]", "in.power", "15 MW").
'
' A plant is a path to a JSON plant description (relative to the workbook's folder) or a
' two-column range of keys (stack.cells) and values (250, "80 degC"). Errors show as #VALUE!
' (wrong arguments or plant) or #NUM! (the model refuses the operating point); ELYMESSAGE with
' the same arguments gives the library's message. Plants are parsed once and kept (up to 32);
' every call solves a fresh copy of its plant's block, so results do not depend on the order in
' which Excel recalculates. ElyblockClear frees them (after editing a plant file within the same
' second, for instance). Strings cross to the library as UTF-8 (WideCharToMultiByte) and come back
' through MultiByteToWideChar. Numbers of a plant range are written into its JSON text with
' Str$, 15 significant digits (a number typed into a cell has no more).
Option Explicit

' ---- the library: every call of elyblock/elyblock.h (ABI 1), 64-bit --------------------------------
' C types: int32_t = Long, double = Double, size_t and pointers = LongPtr; const char* arguments are
' pointers to NUL-terminated UTF-8 bytes (ByVal LongPtr), returned const char* too. Checked by the
' tests against the header's prototypes and elyblock.dll's export table (tests/spreadsheet).
Private Declare PtrSafe Function ely_abi_version Lib "elyblock.dll" () As Long
Private Declare PtrSafe Function ely_version Lib "elyblock.dll" () As LongPtr
Private Declare PtrSafe Function ely_last_error Lib "elyblock.dll" () As LongPtr
Private Declare PtrSafe Function ely_status_text Lib "elyblock.dll" (ByVal status As Long) As LongPtr
Private Declare PtrSafe Function ely_water_saturation_pressure Lib "elyblock.dll" (ByVal temperature_K As Double, ByRef pressure_Pa As Double) As Long
Private Declare PtrSafe Function ely_water_electrolysis_voltages Lib "elyblock.dll" (ByVal temperature_K As Double, ByVal pressure_anode_Pa As Double, ByVal pressure_cathode_Pa As Double, ByRef reversible_V As Double, ByRef thermoneutral_V As Double) As Long
Private Declare PtrSafe Function ely_molar_mass Lib "elyblock.dll" (ByVal formula As LongPtr, ByRef kg_per_mol As Double) As Long
Private Declare PtrSafe Function ely_parse_quantity Lib "elyblock.dll" (ByVal text As LongPtr, ByVal unit As LongPtr, ByRef value As Double) As Long
Private Declare PtrSafe Function ely_block_create Lib "elyblock.dll" (ByVal config_json As LongPtr, ByRef out As LongPtr) As Long
Private Declare PtrSafe Function ely_block_create_from_file Lib "elyblock.dll" (ByVal path As LongPtr, ByRef out As LongPtr) As Long
Private Declare PtrSafe Function ely_block_clone Lib "elyblock.dll" (ByVal block As LongPtr, ByRef out As LongPtr) As Long
Private Declare PtrSafe Sub ely_block_destroy Lib "elyblock.dll" (ByVal block As LongPtr)
Private Declare PtrSafe Function ely_block_variable_count Lib "elyblock.dll" (ByVal block As LongPtr, ByRef count As Long) As Long
Private Declare PtrSafe Function ely_block_variable_info Lib "elyblock.dll" (ByVal block As LongPtr, ByVal index As Long, ByVal info As LongPtr) As Long
Private Declare PtrSafe Function ely_block_find Lib "elyblock.dll" (ByVal block As LongPtr, ByVal name As LongPtr, ByRef index As Long) As Long
Private Declare PtrSafe Function ely_block_set Lib "elyblock.dll" (ByVal block As LongPtr, ByVal index As Long, ByVal value As Double) As Long
Private Declare PtrSafe Function ely_block_get Lib "elyblock.dll" (ByVal block As LongPtr, ByVal index As Long, ByRef value As Double) As Long
Private Declare PtrSafe Function ely_block_set_spec Lib "elyblock.dll" (ByVal block As LongPtr, ByVal spec As LongPtr) As Long
Private Declare PtrSafe Function ely_block_get_spec Lib "elyblock.dll" (ByVal block As LongPtr, ByRef spec As LongPtr) As Long
Private Declare PtrSafe Function ely_block_solve Lib "elyblock.dll" (ByVal block As LongPtr) As Long
Private Declare PtrSafe Function ely_block_solve_batch Lib "elyblock.dll" (ByVal block As LongPtr, ByVal n_points As LongPtr, ByVal n_inputs As Long, ByRef input_indices As Long, ByRef inputs As Double, ByVal n_outputs As Long, ByRef output_indices As Long, ByRef outputs As Double, ByRef point_status As Long, ByVal progress As LongPtr, ByVal user As LongPtr) As Long
Private Declare PtrSafe Function ely_block_solve_batch_threads Lib "elyblock.dll" (ByVal block As LongPtr, ByVal n_points As LongPtr, ByVal n_inputs As Long, ByRef input_indices As Long, ByRef inputs As Double, ByVal n_outputs As Long, ByRef output_indices As Long, ByRef outputs As Double, ByRef point_status As Long, ByVal threads As Long, ByVal progress As LongPtr, ByVal user As LongPtr) As Long
Private Declare PtrSafe Function ely_block_solve_batch_columns Lib "elyblock.dll" (ByVal block As LongPtr, ByVal n_points As LongPtr, ByVal n_inputs As Long, ByRef input_indices As Long, ByRef input_columns As LongPtr, ByVal n_outputs As Long, ByRef output_indices As Long, ByRef output_columns As LongPtr, ByRef point_status As Long, ByVal progress As LongPtr, ByVal user As LongPtr) As Long
Private Declare PtrSafe Function ely_block_report_json Lib "elyblock.dll" (ByVal block As LongPtr, ByVal buffer As LongPtr, ByVal capacity As LongPtr, ByRef length As LongPtr) As Long
Private Declare PtrSafe Function ely_convert_unit Lib "elyblock.dll" (ByVal value As Double, ByVal from_unit As LongPtr, ByVal to_unit As LongPtr, ByRef result As Double) As Long
Private Declare PtrSafe Function ely_block_fit Lib "elyblock.dll" (ByVal block As LongPtr, ByVal n_points As LongPtr, ByVal n_inputs As Long, ByRef input_indices As Long, ByRef inputs As Double, ByVal n_measured As Long, ByRef measured_indices As Long, ByRef measured As Double, ByVal weights As LongPtr, ByVal n_free As Long, ByRef free_names As LongPtr, ByVal options As LongPtr, ByVal progress As LongPtr, ByVal user As LongPtr, ByRef result As LongPtr) As Long
Private Declare PtrSafe Function ely_fit_report_json Lib "elyblock.dll" (ByVal fit As LongPtr, ByVal buffer As LongPtr, ByVal capacity As LongPtr, ByRef length As LongPtr) As Long
Private Declare PtrSafe Function ely_fit_plant_json Lib "elyblock.dll" (ByVal fit As LongPtr, ByVal buffer As LongPtr, ByVal capacity As LongPtr, ByRef length As LongPtr) As Long
Private Declare PtrSafe Function ely_fit_parameter Lib "elyblock.dll" (ByVal fit As LongPtr, ByVal k As Long, ByRef value As Double, ByRef standard_error As Double) As Long
Private Declare PtrSafe Function ely_fit_rmse Lib "elyblock.dll" (ByVal fit As LongPtr, ByVal o As Long, ByRef rmse As Double, ByRef rows As LongPtr) As Long
Private Declare PtrSafe Sub ely_fit_destroy Lib "elyblock.dll" (ByVal fit As LongPtr)
Private Declare PtrSafe Function ely_block_reset Lib "elyblock.dll" (ByVal block As LongPtr, ByVal start_time_s As Double) As Long
Private Declare PtrSafe Function ely_block_advance Lib "elyblock.dll" (ByVal block As LongPtr, ByVal step_s As Double) As Long
Private Declare PtrSafe Function ely_block_time Lib "elyblock.dll" (ByVal block As LongPtr, ByRef time_s As Double) As Long
Private Declare PtrSafe Function ely_block_save_state Lib "elyblock.dll" (ByVal block As LongPtr, ByVal buffer As LongPtr, ByVal capacity As LongPtr, ByRef length As LongPtr) As Long
Private Declare PtrSafe Function ely_block_restore_state Lib "elyblock.dll" (ByVal block As LongPtr, ByVal buffer As LongPtr, ByVal length As LongPtr) As Long
Private Declare PtrSafe Function ely_block_simulate Lib "elyblock.dll" (ByVal block As LongPtr, ByVal n_rows As LongPtr, ByRef times As Double, ByVal n_inputs As Long, ByRef input_indices As Long, ByRef inputs As Double, ByVal n_outputs As Long, ByRef output_indices As Long, ByRef outputs As Double, ByRef row_status As Long, ByVal progress As LongPtr, ByVal user As LongPtr) As Long
Private Declare PtrSafe Function ely_block_run_summary_json Lib "elyblock.dll" (ByVal block As LongPtr, ByVal buffer As LongPtr, ByVal capacity As LongPtr, ByRef length As LongPtr) As Long

' ---- Windows --------------------------------------------------------------------------------------
Private Declare PtrSafe Function LoadLibraryW Lib "kernel32" (ByVal lpLibFileName As LongPtr) As LongPtr
Private Declare PtrSafe Function MultiByteToWideChar Lib "kernel32" (ByVal CodePage As Long, ByVal dwFlags As Long, ByVal lpMultiByteStr As LongPtr, ByVal cbMultiByte As Long, ByVal lpWideCharStr As LongPtr, ByVal cchWideChar As Long) As Long
Private Declare PtrSafe Function WideCharToMultiByte Lib "kernel32" (ByVal CodePage As Long, ByVal dwFlags As Long, ByVal lpWideCharStr As LongPtr, ByVal cchWideChar As Long, ByVal lpMultiByteStr As LongPtr, ByVal cbMultiByte As Long, ByVal lpDefaultChar As LongPtr, ByVal lpUsedDefaultChar As LongPtr) As Long
Private Declare PtrSafe Function lstrlenA Lib "kernel32" (ByVal lpString As LongPtr) As Long
Private Declare PtrSafe Sub RtlMoveMemory Lib "kernel32" (ByVal Destination As LongPtr, ByVal Source As LongPtr, ByVal Length As LongPtr)

Private Const ELY_ABI_VERSION As Long = 1
Private Const CP_UTF8 As Long = 65001
' ely_variable_info on 64-bit Windows: its size and the offsets of the members read here (checked
' by the tests against the header's struct).
Private Const INFO_SIZE As Long = 128
Private Const INFO_CAUSALITY As Long = 4
Private Const INFO_NAME As Long = 8
Private Const INFO_UNIT As Long = 16
Private Const INFO_DESCRIPTION As Long = 24
Private Const INFO_DISPLAY_UNIT As Long = 80
' Errors: #VALUE! for a call whose arguments or plant are wrong, #NUM! for a point the model refuses.
Private Const XL_ERR_VALUE As Long = 2015
Private Const XL_ERR_NUM As Long = 2036
Private Const ERR_VALUE As Long = vbObjectError + 513
Private Const ERR_NUM As Long = vbObjectError + 514
Private Const CACHE_CAPACITY As Long = 32
Private Const ELY_WARNING As Long = 1
Private Const ELY_PARTIAL As Long = 2
Private Const RUN_CAPACITY As Long = 8

' The folder of elyblock.dll; empty: beside the workbook that calls, beside this module's
' workbook, then Windows' DLL search path.
Public ElyblockDllFolder As String

Private loaded As Boolean
Private blocks As Object      ' plant key -> block handle (never solved: calls work on clones)
Private units As Object       ' plant key -> Dictionary of variable name -> SI unit
Private working As LongPtr    ' the clone of the running call, freed when it fails
Private runs As Object        ' profile runs by their arguments: Array(status, message, outputs, row statuses, summary)
Private specs As Variant

' Frees the plants kept by the functions (they are parsed again when next used).
Public Sub ElyblockClear()
    Dim key As Variant
    If Not blocks Is Nothing Then
        For Each key In blocks.Keys
            ely_block_destroy blocks(key)
        Next
    End If
    Set blocks = Nothing
    Set units = Nothing
    Set runs = Nothing
End Sub

' ---- calls -----------------------------------------------------------------------------------------
' Runs function name with its fixed arguments and the repeated last one; the value, or the error value.
Private Function ElyCall(ByVal name As String, ByVal fixed As Variant, ByVal rest As Variant) As Variant
    Dim message As String, failed As Long, result As Variant
    result = ElyRun(name, Arguments(fixed, rest), message, failed)
    If failed <> 0 Then
        ElyCall = CVErr(failed)
    ElseIf IsObject(result) Then
        Set ElyCall = result
    Else
        ElyCall = result
    End If
End Function

' fixed (with trailing missing ones left out) and rest as one array, 0-based.
Private Function Arguments(ByVal fixed As Variant, ByVal rest As Variant) As Variant
    Dim n As Long, k As Long, out() As Variant, count As Long
    count = UBound(fixed) - LBound(fixed) + 1
    Do While count > 0
        If Not IsMissing(fixed(LBound(fixed) + count - 1)) Then Exit Do
        count = count - 1
    Loop
    n = count + UBound(rest) - LBound(rest) + 1
    If n = 0 Then
        Arguments = Array()
        Exit Function
    End If
    ReDim out(0 To n - 1)
    For k = 0 To count - 1
        Bind out(k), fixed(LBound(fixed) + k)
    Next
    For k = count To n - 1
        Bind out(k), rest(LBound(rest) + k - count)
    Next
    Arguments = out
End Function

Private Sub Bind(ByRef target As Variant, ByVal value As Variant)
    If IsObject(value) Then Set target = value Else target = value
End Sub

' The result of one function, with message (the error's, or the warning of a solve) and failed
' (0, or the error value to show).
Private Function ElyRun(ByVal name As String, ByVal args As Variant, ByRef message As String, ByRef failed As Long) As Variant
    Dim fixed As Long, required As Long, repeated As Boolean, n As Long, given As String
    On Error GoTo failure
    message = ""
    failed = 0
    given = Trim$(name)
    name = UCase$(given)
    ElyArity name, fixed, required, repeated
    If fixed < 0 Then
        name = "ELY" & name
        ElyArity name, fixed, required, repeated
    End If
    If fixed < 0 Then Fail "no elyblock function '" & given & "'; the functions are " & ElyFunctionList()
    n = UBound(args) + 1
    If n < required Or (Not repeated And n > fixed) Then
        If repeated Then
            Fail name & ": " & required & " or more arguments expected, got " & n
        ElseIf required = fixed Then
            Fail name & ": " & required & " arguments expected, got " & n
        Else
            Fail name & ": " & required & " to " & fixed & " arguments expected, got " & n
        End If
    End If
    EnsureLoaded
    Select Case name
    Case "ELYSOLVE": ElyRun = RunSolve(args, message)
    Case "ELYOUTPUTS": ElyRun = RunOutputs(args, message)
    Case "ELYPROFILE": ElyRun = RunProfile(args, message)
    Case "ELYSUMMARY": ElyRun = RunSummary(args, message)
    Case "ELYVARIABLES": ElyRun = RunVariables(args)
    Case "ELYVERSION": ElyRun = FromUtf8(ely_version())
    Case "ELYMESSAGE": ElyRun = RunMessage(args)
    End Select
    Exit Function
failure:
    message = Err.Description
    failed = IIf(Err.Number = ERR_NUM, XL_ERR_NUM, XL_ERR_VALUE)
    If working <> 0 Then
        ely_block_destroy working
        working = 0
    End If
    ElyRun = Empty
End Function

Private Sub Fail(ByVal message As String, Optional ByVal refused As Boolean = False)
    Err.Raise IIf(refused, ERR_NUM, ERR_VALUE), "elyblock", message
End Sub

' A status of the library: an error raises with the library's message.
Private Sub Check(ByVal status As Long)
    If status < 0 Then
        Dim message As String
        message = FromUtf8(ely_last_error())
        If message = "" Then message = FromUtf8(ely_status_text(status))
        ' Out of range, infeasible, no convergence: the model refuses the point.
        Fail message, status = -2 Or status = -4 Or status = -5
    End If
End Sub

Private Sub EnsureLoaded()
    Dim folders(0 To 2) As String, k As Long, handle As LongPtr, path As String
    If loaded Then Exit Sub
    folders(0) = ElyblockDllFolder
    folders(1) = CallerFolder()
    folders(2) = ThisWorkbook.path
    For k = 0 To 2
        If folders(k) <> "" Then
            path = folders(k) & "\elyblock.dll"
            handle = LoadLibraryW(StrPtr(path))
            If handle <> 0 Then Exit For
        End If
    Next
    If handle = 0 Then handle = LoadLibraryW(StrPtr("elyblock.dll"))
    If handle = 0 Then Fail "elyblock.dll not found: put it beside the workbook, or set ElyblockDllFolder to its folder"
    ' The Declare statements now bind to the module loaded here (Windows matches it by name).
    If ely_abi_version() <> ELY_ABI_VERSION Then
        Fail "elyblock.dll has ABI version " & ely_abi_version() & "; this module needs " & ELY_ABI_VERSION
    End If
    specs = Array("current_density", "current", "power", "hydrogen_rate", "voltage")
    loaded = True
End Sub

' The folder of the workbook whose cell calls, or "" (a workbook never saved, a call from code).
Private Function CallerFolder() As String
    On Error Resume Next
    CallerFolder = Application.Caller.Worksheet.Parent.path
End Function

' ---- strings: VBA's UTF-16 and the library's UTF-8 ---------------------------------------------------
' The UTF-8 bytes of s with a terminating NUL; pass VarPtr(bytes(0)) while bytes lives.
Private Function Utf8(ByVal s As String) As Byte()
    Dim n As Long, bytes() As Byte
    If Len(s) > 0 Then n = WideCharToMultiByte(CP_UTF8, 0, StrPtr(s), Len(s), 0, 0, 0, 0)
    ReDim bytes(0 To n)
    If n > 0 Then WideCharToMultiByte CP_UTF8, 0, StrPtr(s), Len(s), VarPtr(bytes(0)), n, 0, 0
    bytes(n) = 0
    Utf8 = bytes
End Function

' The text of a NUL-terminated UTF-8 string of the library.
Private Function FromUtf8(ByVal p As LongPtr) As String
    Dim n As Long, m As Long, s As String
    If p = 0 Then Exit Function
    n = lstrlenA(p)
    If n = 0 Then Exit Function
    m = MultiByteToWideChar(CP_UTF8, 0, p, n, 0, 0)
    s = String$(m, vbNullChar)
    MultiByteToWideChar CP_UTF8, 0, p, n, StrPtr(s), m
    FromUtf8 = s
End Function

' ---- cells -------------------------------------------------------------------------------------------
' A value as a 2-D array of cells (1-based): a range as it is, a single value as one cell.
Private Function Cells2D(ByVal value As Variant) As Variant
    Dim out() As Variant, r As Long, c As Long
    If IsObject(value) Then
        If TypeName(value) <> "Range" Then Fail "expected a range or a value, got a " & TypeName(value)
        If value.Areas.count > 1 Then Fail "a range of several areas cannot be read"
        If value.Cells.count = 1 Then
            ReDim out(1 To 1, 1 To 1)
            out(1, 1) = value.Value2
        Else
            out = value.Value2
        End If
    ElseIf IsArray(value) Then
        On Error Resume Next
        c = UBound(value, 2)
        If Err.Number <> 0 Then  ' one row: {1, 2, 3}
            Err.Clear
            On Error GoTo 0
            ReDim out(1 To 1, 1 To UBound(value) - LBound(value) + 1)
            For c = LBound(value) To UBound(value)
                out(1, c - LBound(value) + 1) = value(c)
            Next
        Else
            On Error GoTo 0
            ReDim out(1 To UBound(value, 1) - LBound(value, 1) + 1, 1 To UBound(value, 2) - LBound(value, 2) + 1)
            For r = LBound(value, 1) To UBound(value, 1)
                For c = LBound(value, 2) To UBound(value, 2)
                    out(r - LBound(value, 1) + 1, c - LBound(value, 2) + 1) = value(r, c)
                Next
            Next
        End If
    Else
        ReDim out(1 To 1, 1 To 1)
        out(1, 1) = value
    End If
    For r = 1 To UBound(out, 1)
        For c = 1 To UBound(out, 2)
            If IsError(out(r, c)) Then Fail "a cell of the range holds an error value"
        Next
    Next
    Cells2D = out
End Function

Private Function IsBlank(ByVal cell As Variant) As Boolean
    If IsMissing(cell) Or IsEmpty(cell) Then
        IsBlank = True
    ElseIf VarType(cell) = vbString Then
        IsBlank = (Trim$(cell) = "")
    End If
End Function

' The one value of an argument that may be a one-cell range.
Private Function Single1(ByVal value As Variant, ByVal what As String) As Variant
    Dim cells As Variant
    If IsMissing(value) Then
        Single1 = Empty
        Exit Function
    End If
    cells = Cells2D(value)
    If UBound(cells, 1) <> 1 Or UBound(cells, 2) <> 1 Then
        Fail what & ": expected one cell, got a range of " & UBound(cells, 1) & " x " & UBound(cells, 2)
    End If
    Single1 = cells(1, 1)
End Function

Private Function TextArgument(ByVal value As Variant, ByVal what As String, Optional ByVal canBeEmpty As Boolean = False) As String
    Dim cell As Variant
    cell = Single1(value, what)
    If IsBlank(cell) Then
        If Not canBeEmpty Then Fail what & ": empty"
        Exit Function
    End If
    If VarType(cell) <> vbString Then Fail what & ": expected a text, got the number " & NumberText(cell)
    TextArgument = Trim$(cell)
End Function

' A number as JSON text: integral values without a decimal point, others with Str$ (15 digits).
Private Function NumberText(ByVal x As Double) As String
    Dim s As String
    If x = Fix(x) And Abs(x) < 1E+15 Then
        NumberText = Format$(x, "0")
        Exit Function
    End If
    s = Trim$(Str$(x))
    If Left$(s, 1) = "." Then s = "0" & s
    If Left$(s, 2) = "-." Then s = "-0" & Mid$(s, 2)
    NumberText = s
End Function

' "product.hydrogen [kg/h]" -> name "product.hydrogen", unit "kg/h" ("" without brackets).
Private Sub NameAndUnit(ByVal text As String, ByRef name As String, ByRef unit As String, ByVal what As String)
    Dim openAt As Long, closeAt As Long
    text = Trim$(text)
    openAt = InStr(text, "[")
    closeAt = InStr(text, "]")
    If openAt = 0 And closeAt = 0 Then
        name = text
        unit = ""
    ElseIf openAt > 1 And closeAt = Len(text) And closeAt > openAt Then
        name = Trim$(Left$(text, openAt - 1))
        unit = Trim$(Mid$(text, openAt + 1, closeAt - openAt - 1))
    Else
        name = ""
    End If
    If name = "" Or InStr(name, " ") > 0 Or InStr(name, "]") > 0 Or InStr(unit, "[") > 0 Then
        Fail what & ": '" & text & "' is not a variable name with an optional unit in brackets (e.g. 'product.hydrogen [kg/h]')"
    End If
End Sub

' ---- plants ------------------------------------------------------------------------------------------
Private Function NewDictionary() As Object
    Set NewDictionary = CreateObject("Scripting.Dictionary")
    NewDictionary.CompareMode = 0  ' binary: keys are case-sensitive
End Function

' The JSON text of a plant given as rows of key and value (see functions.json).
Private Function PlantJson(ByVal cells As Variant) As String
    Dim tree As Object, seen As Object, node As Object, r As Long, d As Long
    Dim key As Variant, value As Variant, parts() As String, path As String, last As String
    Set tree = NewDictionary()
    Set seen = NewDictionary()
    For r = 1 To UBound(cells, 1)
        key = cells(r, 1)
        value = cells(r, 2)
        If IsBlank(key) Then
            If Not IsBlank(value) Then Fail "plant range, row " & r & ": a value without a key"
        ElseIf VarType(key) <> vbString Then
            Fail "plant range, row " & r & ": the key is the number " & NumberText(key) & ", not a text"
        ElseIf Left$(Trim$(key), 1) <> "#" Then
            key = Trim$(key)
            parts = Split(key, ".")
            For d = 0 To UBound(parts)
                If parts(d) = "" Then Fail "plant range, row " & r & ": the key '" & key & "' has an empty part"
            Next
            If seen.Exists(key) Then Fail "plant range, rows " & seen(key) & " and " & r & ": the key '" & key & "' is given twice"
            seen.Add key, r
            If IsBlank(value) Then Fail "plant range, row " & r & ": the key '" & key & "' has no value"
            Set node = tree
            path = ""
            For d = 0 To UBound(parts) - 1
                path = path & IIf(d > 0, ".", "") & parts(d)
                If Not node.Exists(parts(d)) Then node.Add parts(d), NewDictionary()
                If Not IsObject(node(parts(d))) Then
                    Fail "plant range, row " & r & ": '" & path & "' has a value, so '" & key & "' cannot be under it"
                End If
                Set node = node(parts(d))
            Next
            last = parts(UBound(parts))
            If node.Exists(last) Then Fail "plant range, row " & r & ": '" & key & "' holds keys below it, so it cannot have a value"
            node.Add last, JsonValue(value)
        End If
    Next
    PlantJson = JsonObject(tree)
End Function

Private Function JsonValue(ByVal value As Variant) As String
    Dim text As String
    Select Case VarType(value)
    Case vbBoolean
        JsonValue = IIf(value, "true", "false")
    Case vbString
        text = Trim$(value)
        If LCase$(text) = "true" Or LCase$(text) = "false" Then
            JsonValue = LCase$(text)
        ElseIf Left$(text, 1) = "[" Or Left$(text, 1) = "{" Then
            JsonValue = text  ' JSON itself (a reaction table, a list): the library reads and checks it
        Else
            JsonValue = JsonString(text)
        End If
    Case Else
        JsonValue = NumberText(CDbl(value))
    End Select
End Function

Private Function JsonObject(ByVal node As Object) As String
    Dim key As Variant, s As String
    For Each key In node.Keys
        If s <> "" Then s = s & ", "
        s = s & JsonString(CStr(key)) & ": "
        If IsObject(node(key)) Then s = s & JsonObject(node(key)) Else s = s & node(key)
    Next
    JsonObject = "{" & s & "}"
End Function

Private Function JsonString(ByVal text As String) As String
    Dim k As Long, ch As String, code As Long, out As String
    For k = 1 To Len(text)
        ch = Mid$(text, k, 1)
        code = AscW(ch)
        Select Case code
        Case 34: out = out & "\"""
        Case 92: out = out & "\\"
        Case 8: out = out & "\b"
        Case 9: out = out & "\t"
        Case 10: out = out & "\n"
        Case 12: out = out & "\f"
        Case 13: out = out & "\r"
        Case 0 To 31: out = out & "\u00" & Right$("0" & LCase$(Hex$(code)), 2)
        Case Else: out = out & ch
        End Select
    Next
    JsonString = """" & out & """"
End Function

' The block of a plant argument (created on first use, then kept) and its key.
Private Function PlantBlock(ByVal plant As Variant, ByRef key As String) As LongPtr
    Dim cells As Variant, path As String, handle As LongPtr, bytes() As Byte, text As String
    cells = Cells2D(plant)
    If UBound(cells, 1) = 1 And UBound(cells, 2) = 1 Then
        If IsBlank(cells(1, 1)) Then Fail "plant: empty; give a path to a JSON plant description or a two-column range of keys and values"
        If VarType(cells(1, 1)) <> vbString Then Fail "plant: the number " & NumberText(cells(1, 1)) & " is neither a path nor a range of keys and values"
        path = ResolvePath(Trim$(cells(1, 1)))
        key = "file" & vbTab & path
        If Dir$(path) <> "" Then key = key & vbTab & FileLen(path) & vbTab & FileDateTime(path)
    ElseIf UBound(cells, 2) <> 2 Then
        Fail "plant: a plant range has two columns (key, value); this one has " & UBound(cells, 2)
    Else
        text = PlantJson(cells)
        key = "text" & vbTab & text
    End If
    If blocks Is Nothing Then
        Set blocks = NewDictionary()
        Set units = NewDictionary()
    End If
    If blocks.Exists(key) Then
        PlantBlock = blocks(key)
        Exit Function
    End If
    If path <> "" Then
        bytes = Utf8(path)
        Check ely_block_create_from_file(VarPtr(bytes(0)), handle)
    Else
        bytes = Utf8(text)
        Check ely_block_create(VarPtr(bytes(0)), handle)
    End If
    If blocks.count >= CACHE_CAPACITY Then ElyblockClear: Set blocks = NewDictionary(): Set units = NewDictionary()
    blocks.Add key, handle
    units.Add key, VariableUnits(handle)
    PlantBlock = handle
End Function

Private Function ResolvePath(ByVal path As String) As String
    Dim folder As String
    If path Like "[A-Za-z]:*" Or Left$(path, 1) = "\" Or Left$(path, 1) = "/" Then
        ResolvePath = path
        Exit Function
    End If
    folder = CallerFolder()
    If folder = "" Then Fail "plant: '" & path & "' is a relative path and this workbook has no folder yet (save it, or give an absolute path)"
    ResolvePath = folder & "\" & path
End Function

' name -> SI unit of every variable of a block.
Private Function VariableUnits(ByVal block As LongPtr) As Object
    Dim count As Long, k As Long, info(0 To INFO_SIZE - 1) As Byte, table As Object
    Set table = NewDictionary()
    Check ely_block_variable_count(block, count)
    For k = 0 To count - 1
        InfoRead block, k, info
        table(InfoText(info, INFO_NAME)) = InfoText(info, INFO_UNIT)
    Next
    Set VariableUnits = table
End Function

Private Sub InfoRead(ByVal block As LongPtr, ByVal index As Long, ByRef info() As Byte)
    Dim size As Long, k As Long
    For k = 0 To INFO_SIZE - 1
        info(k) = 0
    Next
    size = INFO_SIZE
    RtlMoveMemory VarPtr(info(0)), VarPtr(size), 4
    Check ely_block_variable_info(block, index, VarPtr(info(0)))
End Sub

Private Function InfoText(ByRef info() As Byte, ByVal offset As Long) As String
    Dim p As LongPtr
    RtlMoveMemory VarPtr(p), VarPtr(info(offset)), 8
    InfoText = FromUtf8(p)
End Function

' ---- operating points ---------------------------------------------------------------------------------
' A clone of the plant's block with the inputs (args from first on) set and solved; warning gets the
' alarms of a solve that raised some. The clone is `working` until the caller frees it.
Private Function Solved(ByVal args As Variant, ByVal first As Long, ByRef warning As String, ByRef table As Object) As LongPtr
    Dim key As String, base As LongPtr, k As Long, spec As String, drives As String, status As Long
    Dim names() As String, values() As Double, n As Long
    base = PlantBlock(args(0), key)
    Set table = units(key)
    ReadPairs args, first, base, table, spec, names, values, n, drives
    spec = ChosenSpec(spec, drives)
    CloneWithInputs base, spec, names, values, n
    status = ely_block_solve(working)
    If status > 0 Then warning = FromUtf8(ely_last_error())
    Check status
    Solved = working
End Function

' `working`: a clone of base with the spec (unless "") and the n inputs set.
Private Sub CloneWithInputs(ByVal base As LongPtr, ByVal spec As String, ByRef names() As String, ByRef values() As Double, ByVal n As Long)
    Dim k As Long, index As Long, bytes() As Byte
    Check ely_block_clone(base, working)
    If spec <> "" Then
        bytes = Utf8(spec)
        Check ely_block_set_spec(working, VarPtr(bytes(0)))
    End If
    For k = 0 To n - 1
        bytes = Utf8(names(k))
        Check ely_block_find(working, VarPtr(bytes(0)), index)
        Check ely_block_set(working, index, values(k))
    Next
End Sub

' The pairs of name and value of args from first on: the spec of a pair "spec" (or ""), the n inputs
' to set (names and SI values), and the drive inputs among them (" and " between them).
Private Sub ReadPairs(ByVal args As Variant, ByVal first As Long, ByVal base As LongPtr, ByVal table As Object, _
                      ByRef spec As String, ByRef names() As String, ByRef values() As Double, ByRef n As Long, _
                      ByRef drives As String)
    Dim k As Long, rawName As String, name As String, unit As String, value As Variant
    n = 0
    If ((UBound(args) - first + 1) Mod 2) <> 0 Then
        Fail "inputs come in pairs of name and value; the last name, " & Quoted(args(UBound(args))) & ", has no value"
    End If
    If UBound(args) >= first Then
        ReDim names(0 To (UBound(args) - first + 1) \ 2 - 1)
        ReDim values(0 To UBound(names))
    End If
    For k = first To UBound(args) Step 2
        rawName = TextArgument(args(k), "input name " & ((k - first) \ 2 + 1))
        value = Single1(args(k + 1), "value of " & rawName)
        If LCase$(rawName) = "spec" Then
            spec = TextArgument(value, "value of spec")
        Else
            NameAndUnit rawName, name, unit, "input name " & ((k - first) \ 2 + 1)
            If InStr(name, ".") = 0 Then
                If table.Exists("in." & name) Or Not table.Exists("param." & name) Then name = "in." & name Else name = "param." & name
            End If
            If Not table.Exists(name) Then UnknownName base, name
            names(n) = name
            values(n) = SIValue(value, unit, table(name), rawName)
            n = n + 1
            AddDrive drives, name
        End If
    Next
End Sub

' The spec the pair "spec" names, else the one whose drive input is set (drives: " and " between them).
Private Function ChosenSpec(ByVal spec As String, ByVal drives As String) As String
    If spec = "" And drives <> "" Then
        If InStr(drives, " and ") > 0 Then
            Fail drives & " are the drive inputs of different specs: set one, or choose the spec with the pair ""spec""; ""<name>"""
        End If
        spec = Mid$(drives, 4)
    End If
    ChosenSpec = spec
End Function

Private Sub AddDrive(ByRef drives As String, ByVal name As String)
    If IsDrive(name) And InStr(" and " & drives & " and ", " and " & name & " and ") = 0 Then
        drives = drives & IIf(drives <> "", " and ", "") & name
    End If
End Sub

Private Function IsDrive(ByVal name As String) As Boolean
    Dim s As Variant
    For Each s In specs
        If name = "in." & s Then IsDrive = True
    Next
End Function

' An unknown name fails with the library's message.
Private Sub UnknownName(ByVal block As LongPtr, ByVal name As String)
    Dim bytes() As Byte, index As Long
    bytes = Utf8(name)
    Check ely_block_find(block, VarPtr(bytes(0)), index)
    Fail "'" & name & "' is not in the plant's variable table"
End Sub

Private Function SIValue(ByVal value As Variant, ByVal unit As String, ByVal si As String, ByVal rawName As String) As Double
    Dim number As Double, text() As Byte, target() As Byte
    If IsBlank(value) Then Fail rawName & ": no value (an empty cell)"
    If VarType(value) = vbString Then
        text = Utf8(Trim$(value))
        target = Utf8(IIf(unit <> "", unit, si))
        Check ely_parse_quantity(VarPtr(text(0)), VarPtr(target(0)), number)
    ElseIf VarType(value) = vbBoolean Then
        number = IIf(value, 1, 0)
    Else
        number = CDbl(value)
    End If
    If unit <> "" Then number = ConvertUnit(number, unit, si)
    SIValue = number
End Function

Private Function ConvertUnit(ByVal value As Double, ByVal fromUnit As String, ByVal toUnit As String) As Double
    Dim a() As Byte, b() As Byte, result As Double
    If fromUnit = toUnit Then
        ConvertUnit = value
        Exit Function
    End If
    a = Utf8(fromUnit)
    b = Utf8(toUnit)
    Check ely_convert_unit(value, VarPtr(a(0)), VarPtr(b(0)), result)
    ConvertUnit = result
End Function

' The value of "name [unit]" on a solved block.
Private Function OutputValue(ByVal block As LongPtr, ByVal table As Object, ByVal text As String) As Double
    Dim name As String, unit As String, bytes() As Byte, index As Long, value As Double
    NameAndUnit text, name, unit, "variable"
    If Not table.Exists(name) Then UnknownName block, name
    bytes = Utf8(name)
    Check ely_block_find(block, VarPtr(bytes(0)), index)
    Check ely_block_get(block, index, value)
    If unit <> "" Then value = ConvertUnit(value, table(name), unit)
    OutputValue = value
End Function

Private Function Quoted(ByVal value As Variant) As String
    Dim cell As Variant
    On Error Resume Next
    cell = Cells2D(value)(1, 1)
    If VarType(cell) = vbString Then Quoted = "'" & cell & "'" Else Quoted = CStr(cell)
End Function

' ---- the functions ---------------------------------------------------------------------------------------
Private Function RunSolve(ByVal args As Variant, ByRef warning As String) As Variant
    Dim text As String, table As Object, block As LongPtr
    text = TextArgument(args(1), "variable")
    block = Solved(args, 2, warning, table)
    RunSolve = OutputValue(block, table, text)
    ely_block_destroy working
    working = 0
End Function

Private Function RunOutputs(ByVal args As Variant, ByRef warning As String) As Variant
    Dim names As Variant, out() As Variant, r As Long, c As Long, table As Object, block As LongPtr, someName As Boolean
    names = Cells2D(args(1))
    For r = 1 To UBound(names, 1)
        For c = 1 To UBound(names, 2)
            If Not IsBlank(names(r, c)) Then someName = True
        Next
    Next
    If Not someName Then Fail "variables: no variable names"
    block = Solved(args, 2, warning, table)
    ReDim out(1 To UBound(names, 1), 1 To UBound(names, 2))
    For r = 1 To UBound(names, 1)
        For c = 1 To UBound(names, 2)
            If IsBlank(names(r, c)) Then
                out(r, c) = ""
            ElseIf VarType(names(r, c)) <> vbString Then
                Fail "variables: expected names, got the number " & NumberText(names(r, c))
            Else
                out(r, c) = OutputValue(block, table, names(r, c))
            End If
        Next
    Next
    ely_block_destroy working
    working = 0
    RunOutputs = out
End Function

' ---- profiles (the plant in time, ely_block_simulate) ----------------------------------------------------
' The run of args(0)'s plant through the profile args(1) with the pairs of args from first on, reading
' the variables outputNames (n_out of them; may be 0): Array(status, message, outputs(row, k) SI,
' row statuses, summary as a Dictionary). Kept for RUN_CAPACITY calls with the same arguments.
Private Function ProfileRun(ByVal args As Variant, ByVal first As Long, ByRef outputNames() As String, _
                            ByVal nOut As Long) As Variant
    Dim key As String, base As LongPtr, table As Object, cells As Variant, runKey As String
    Dim spec As String, drives As String, names() As String, values() As Double, n As Long
    Dim header() As String, columnUnits() As String, columns() As String, timeUnit As String, rawName As String
    Dim nRows As Long, nIn As Long, r As Long, c As Long, k As Long, t As Double, name As String, unit As String
    Dim times() As Double, inputs() As Double, inIndex() As Long, outIndex() As Long, outputs() As Double
    Dim status() As Long, result As Long, message As String, bytes() As Byte, rows() As Double, summary As Object
    base = PlantBlock(args(0), key)
    Set table = units(key)
    cells = Cells2D(args(1))
    runKey = key & vbLf & CellsKey(cells) & vbLf & Join(outputNames, vbTab)
    For k = first To UBound(args)
        runKey = runKey & vbLf & CellsKey(Cells2D(args(k)))
    Next
    If runs Is Nothing Then Set runs = NewDictionary()
    If runs.Exists(runKey) Then
        ProfileRun = runs(runKey)
        Exit Function
    End If
    ' The rows in use: trailing empty rows of a longer range are none.
    nRows = UBound(cells, 1)
    Do While nRows > 0
        For c = 1 To UBound(cells, 2)
            If Not IsBlank(cells(nRows, c)) Then Exit Do
        Next
        nRows = nRows - 1
    Loop
    If nRows < 2 Then Fail "profile: a header row (""time [h]"", ""power [MW]"", ...) and at least one row of values are needed"
    nIn = UBound(cells, 2) - 1
    ReDim header(0 To nIn)
    ReDim columnUnits(0 To nIn)
    ReDim columns(0 To IIf(nIn > 0, nIn - 1, 0))
    For c = 0 To nIn
        If IsBlank(cells(1, c + 1)) Or VarType(cells(1, c + 1)) <> vbString Then
            Fail "profile, column " & (c + 1) & ": the header " & Quoted(cells(1, c + 1)) & " is not a column name such as ""time [h]"" or ""power [MW]"""
        End If
        header(c) = Trim$(cells(1, c + 1))
        NameAndUnit header(c), name, unit, "profile, column " & (c + 1)
        columnUnits(c) = unit
        If c = 0 Then
            If name <> "time" And name <> "t" Then Fail "profile: the first column is '" & header(0) & "'; it must be the time, e.g. ""time [h]"""
            timeUnit = IIf(unit = "", "s", unit)
            ConvertUnit 1, timeUnit, "s"
        Else
            Select Case name
            Case "power", "current", "current_density": name = "in." & name
            Case Else: If InStr(name, ".") = 0 Then name = "in." & name
            End Select
            If Not table.Exists(name) Then UnknownName base, name
            For k = 0 To c - 2
                If columns(k) = name Then Fail "profile: column '" & header(c) & "' gives " & name & " a second time"
            Next
            columns(c - 1) = name
        End If
    Next
    If nIn = 0 Then Fail "profile: no input column after the time"
    ReDim times(0 To nRows - 2)
    ReDim inputs(0 To (nRows - 1) * nIn - 1)
    For r = 2 To nRows
        For c = 0 To nIn
            rawName = "profile, row " & r & ", column '" & header(c) & "'"
            If c = 0 Then
                t = SIValue(cells(r, 1), timeUnit, "s", rawName)
                If r > 2 Then
                    If t < times(r - 3) Then Fail rawName & ": the time goes back (rows are in time order)"
                End If
                times(r - 2) = t
            Else
                inputs((r - 2) * nIn + c - 1) = SIValue(cells(r, c + 1), columnUnits(c), table(columns(c - 1)), rawName)
            End If
        Next
    Next
    ReadPairs args, first, base, table, spec, names, values, n, drives
    For c = 0 To nIn - 1
        For k = 0 To n - 1
            If names(k) = columns(c) Then Fail columns(c) & " is a column of the profile ('" & header(c + 1) & "') and an input pair: give it once"
        Next
        AddDrive drives, columns(c)
    Next
    spec = ChosenSpec(spec, drives)
    CloneWithInputs base, spec, names, values, n
    ReDim inIndex(0 To nIn - 1)
    For c = 0 To nIn - 1
        bytes = Utf8(columns(c))
        Check ely_block_find(working, VarPtr(bytes(0)), inIndex(c))
    Next
    ' The arrays go ByRef by their first element; with no outputs, one element each that is not used.
    ReDim outIndex(0 To IIf(nOut > 0, nOut - 1, 0))
    ReDim outputs(0 To IIf(nOut > 0, (nRows - 1) * nOut - 1, 0))
    For k = 0 To nOut - 1
        If Not table.Exists(outputNames(k)) Then UnknownName base, outputNames(k)
        bytes = Utf8(outputNames(k))
        Check ely_block_find(working, VarPtr(bytes(0)), outIndex(k))
    Next
    ReDim status(0 To nRows - 2)
    result = ely_block_simulate(working, nRows - 1, times(0), nIn, inIndex(0), inputs(0), nOut, outIndex(0), _
                                outputs(0), status(0), 0, 0)
    If result <> 0 Then message = FromUtf8(ely_last_error())
    Check result
    Set summary = JsonParse(SummaryJson(working))
    ely_block_destroy working
    working = 0
    If runs.count >= RUN_CAPACITY Then Set runs = NewDictionary()
    runs.Add runKey, Array(result, message, outputs, status, summary)
    ProfileRun = runs(runKey)
End Function

' The cells of a 2-D array as one text (for the key of a run); numbers by their 64 bits, so that
' two values that print alike (15 digits) are two keys.
Private Function CellsKey(ByVal cells As Variant) As String
    Dim parts() As String, r As Long, c As Long, k As Long, x As Double, bits As LongLong
    ReDim parts(0 To UBound(cells, 1) * UBound(cells, 2) - 1)
    For r = 1 To UBound(cells, 1)
        For c = 1 To UBound(cells, 2)
            If VarType(cells(r, c)) = vbDouble Then
                x = cells(r, c)
                RtlMoveMemory VarPtr(bits), VarPtr(x), 8
                parts(k) = "d" & Hex$(bits)
            Else
                parts(k) = VarType(cells(r, c)) & ":" & CStr(cells(r, c))
            End If
            k = k + 1
        Next
    Next
    CellsKey = UBound(cells, 2) & "|" & Join(parts, vbTab)
End Function

Private Function SummaryJson(ByVal block As LongPtr) As String
    Dim length As LongPtr, bytes() As Byte
    Check ely_block_run_summary_json(block, 0, 0, length)
    ReDim bytes(0 To CLng(length) - 1)
    Check ely_block_run_summary_json(block, VarPtr(bytes(0)), length, length)
    SummaryJson = FromUtf8(VarPtr(bytes(0)))
End Function

' An error raised for the row a run stopped at: #NUM! when the model refused it.
Private Sub FailStopped(ByVal message As String, ByVal status As Variant)
    Dim k As Long
    For k = 0 To UBound(status)
        If status(k) < 0 Then Fail message, status(k) = -2 Or status(k) = -4 Or status(k) = -5
    Next
    Fail message
End Sub

' The names of a row or column of variable names "name [unit]" (empty cells: "").
Private Sub OutputColumns(ByVal cells As Variant, ByVal table As Object, ByVal base As LongPtr, ByRef wanted() As String, _
                          ByRef wantedUnits() As String, ByRef names() As String, ByRef nOut As Long)
    Dim r As Long, c As Long, k As Long, name As String, unit As String
    If UBound(cells, 1) > 1 And UBound(cells, 2) > 1 Then
        Fail "outputs: a row or a column of variable names, not a range of " & UBound(cells, 1) & " x " & UBound(cells, 2)
    End If
    ReDim wanted(0 To UBound(cells, 1) * UBound(cells, 2) - 1)
    ReDim wantedUnits(0 To UBound(wanted))
    ReDim names(0 To UBound(wanted))
    nOut = 0
    For r = 1 To UBound(cells, 1)
        For c = 1 To UBound(cells, 2)
            If IsBlank(cells(r, c)) Then
                wanted(k) = ""
            ElseIf VarType(cells(r, c)) <> vbString Then
                Fail "outputs: expected names, got the number " & NumberText(cells(r, c))
            Else
                NameAndUnit cells(r, c), name, unit, "outputs"
                If Not table.Exists(name) Then UnknownName base, name
                wanted(k) = name
                wantedUnits(k) = unit
                names(nOut) = name
                nOut = nOut + 1
            End If
            k = k + 1
        Next
    Next
    If nOut = 0 Then Fail "outputs: no variable names"
End Sub

Private Function RunProfile(ByVal args As Variant, ByRef warning As String) As Variant
    Dim key As String, base As LongPtr, table As Object, wanted() As String, wantedUnits() As String
    Dim names() As String, nOut As Long, run As Variant, outputs As Variant, out() As Variant, rows As Long
    Dim r As Long, k As Long, j As Long, value As Double
    base = PlantBlock(args(0), key)
    Set table = units(key)
    OutputColumns Cells2D(args(2)), table, base, wanted, wantedUnits, names, nOut
    run = ProfileRun(args, 3, names, nOut)
    warning = run(1)
    outputs = run(2)
    rows = UBound(run(3)) + 1
    ReDim out(1 To rows, 1 To UBound(wanted) + 1)
    For r = 0 To rows - 1
        j = 0
        For k = 0 To UBound(wanted)
            If wanted(k) = "" Then
                out(r + 1, k + 1) = ""
            Else
                value = outputs(r * nOut + j)
                j = j + 1
                If run(3)(r) < 0 Then
                    out(r + 1, k + 1) = CVErr(XL_ERR_NUM)  ' rows after the run stopped
                ElseIf wantedUnits(k) <> "" Then
                    out(r + 1, k + 1) = ConvertUnit(value, table(wanted(k)), wantedUnits(k))
                Else
                    out(r + 1, k + 1) = value
                End If
            End If
        Next
    Next
    RunProfile = out
End Function

Private Function RunSummary(ByVal args As Variant, ByRef warning As String) As Variant
    Dim run As Variant, figures As Object, figure As Object, cells As Variant, out() As Variant, r As Long, c As Long
    Dim names() As String, name As String, unit As String, someName As Boolean, key As Variant, display As String
    cells = Cells2D(args(2))
    For r = 1 To UBound(cells, 1)
        For c = 1 To UBound(cells, 2)
            If Not IsBlank(cells(r, c)) Then someName = True
        Next
    Next
    ReDim names(0 To 0)
    run = ProfileRun(args, 3, names, 0)
    warning = run(1)
    If run(0) = ELY_PARTIAL Then FailStopped run(1), run(3)  ' the summary of a run cut short is not the profile's
    Set figures = run(4)("figures")
    If Not someName Then
        ReDim out(0 To figures.count, 0 To 3)
        out(0, 0) = "figure": out(0, 1) = "value": out(0, 2) = "unit": out(0, 3) = "label"
        r = 0
        For Each key In figures.Keys
            r = r + 1
            Set figure = figures(key)
            display = figure("display_unit")
            If display = "" Then display = figure("unit")
            out(r, 0) = key
            If IsNull(figure("value")) Then
                out(r, 1) = ""
            Else
                out(r, 1) = figure("value") * figure("display_scale") + figure("display_offset")
            End If
            out(r, 2) = IIf(display = "1", "", display)
            out(r, 3) = figure("label")
        Next
        RunSummary = out
        Exit Function
    End If
    ReDim out(1 To UBound(cells, 1), 1 To UBound(cells, 2))
    For r = 1 To UBound(cells, 1)
        For c = 1 To UBound(cells, 2)
            If IsBlank(cells(r, c)) Then
                out(r, c) = ""
            ElseIf VarType(cells(r, c)) <> vbString Then
                Fail "figures: expected names, got the number " & NumberText(cells(r, c))
            Else
                NameAndUnit cells(r, c), name, unit, "figures"
                If Not figures.Exists(name) Then
                    Fail "figures: the run summary has no figure '" & name & "'; it has " & Join(figures.Keys, ", ")
                End If
                Set figure = figures(name)
                If IsNull(figure("value")) Then Fail "figures: " & name & " (" & figure("label") & ") has no value for this run"
                If unit <> "" Then
                    out(r, c) = ConvertUnit(figure("value"), figure("unit"), unit)
                Else
                    out(r, c) = figure("value")
                End If
            End If
        Next
    Next
    RunSummary = out
End Function

' ---- JSON (the run summary) -------------------------------------------------------------------------------
' The value of a JSON text: objects as Dictionaries (keys in their order), arrays as Collections,
' strings, numbers as Double, null as Null, true and false as Boolean.
Private Function JsonParse(ByVal text As String) As Variant
    Dim at As Long, result As Variant
    at = 1
    JsonValueAt text, at, result
    If IsObject(result) Then Set JsonParse = result Else JsonParse = result
End Function

Private Sub JsonSkip(ByRef text As String, ByRef at As Long)
    Do While at <= Len(text)
        Select Case Mid$(text, at, 1)
        Case " ", vbTab, vbCr, vbLf: at = at + 1
        Case Else: Exit Do
        End Select
    Loop
End Sub

' Reads the value at position at (1-based) into value and moves at past it. Every value read goes
' into a fresh Variant (a member is read by JsonMember), so no Variant holding an object is assigned.
Private Sub JsonValueAt(ByRef text As String, ByRef at As Long, ByRef value As Variant)
    Dim ch As String, node As Object, list As Collection, start As Long
    JsonSkip text, at
    ch = Mid$(text, at, 1)
    Select Case ch
    Case "{"
        Set node = NewDictionary()
        at = at + 1
        JsonSkip text, at
        If Mid$(text, at, 1) = "}" Then
            at = at + 1
        Else
            Do
                JsonMember text, at, node
                JsonSkip text, at
                ch = Mid$(text, at, 1)
                at = at + 1
                If ch = "}" Then Exit Do
                If ch <> "," Then Fail "run summary: ',' or '}' expected at character " & (at - 1)
            Loop
        End If
        Set value = node
    Case "["
        Set list = New Collection
        at = at + 1
        JsonSkip text, at
        If Mid$(text, at, 1) = "]" Then
            at = at + 1
        Else
            Do
                JsonItem text, at, list
                JsonSkip text, at
                ch = Mid$(text, at, 1)
                at = at + 1
                If ch = "]" Then Exit Do
                If ch <> "," Then Fail "run summary: ',' or ']' expected at character " & (at - 1)
            Loop
        End If
        Set value = list
    Case """"
        value = JsonStringAt(text, at)
    Case "n"
        value = Null
        at = at + 4
    Case "t"
        value = True
        at = at + 4
    Case "f"
        value = False
        at = at + 5
    Case Else
        start = at
        Do While at <= Len(text)
            If InStr("+-0123456789.eE", Mid$(text, at, 1)) = 0 Then Exit Do
            at = at + 1
        Loop
        If at = start Then Fail "run summary: unexpected '" & ch & "' at character " & at
        value = Val(Mid$(text, start, at - start))  ' Val reads '.' and exponents in any locale
    End Select
End Sub

Private Sub JsonMember(ByRef text As String, ByRef at As Long, ByVal node As Object)
    Dim key As String, member As Variant
    JsonSkip text, at
    If Mid$(text, at, 1) <> """" Then Fail "run summary: a key expected at character " & at
    key = JsonStringAt(text, at)
    JsonSkip text, at
    If Mid$(text, at, 1) <> ":" Then Fail "run summary: ':' expected at character " & at
    at = at + 1
    JsonValueAt text, at, member
    node.Add key, member
End Sub

Private Sub JsonItem(ByRef text As String, ByRef at As Long, ByVal list As Collection)
    Dim item As Variant
    JsonValueAt text, at, item
    list.Add item
End Sub

' The JSON string starting at position at (its opening quote); at moves past its closing quote.
Private Function JsonStringAt(ByRef text As String, ByRef at As Long) As String
    Dim out As String, ch As String
    at = at + 1
    Do While at <= Len(text)
        ch = Mid$(text, at, 1)
        If ch = """" Then
            at = at + 1
            JsonStringAt = out
            Exit Function
        End If
        If ch = "\" Then
            at = at + 1
            ch = Mid$(text, at, 1)
            Select Case ch
            Case "b": ch = Chr$(8)
            Case "f": ch = Chr$(12)
            Case "n": ch = vbLf
            Case "r": ch = vbCr
            Case "t": ch = vbTab
            Case "u"
                ch = ChrW$(CLng("&H" & Mid$(text, at + 1, 4)))
                at = at + 4
            End Select
        End If
        out = out & ch
        at = at + 1
    Loop
    Fail "run summary: a string without its closing quote"
End Function

Private Function RunVariables(ByVal args As Variant) As Variant
    Dim key As String, block As LongPtr, wanted As String, count As Long, k As Long, n As Long
    Dim info(0 To INFO_SIZE - 1) As Byte, causality As Long, kinds As Variant, out() As Variant, rows As Collection
    Dim row As Variant, display As String
    If UBound(args) >= 1 Then wanted = LCase$(TextArgument(args(1), "causality", True))
    If wanted <> "" And wanted <> "input" And wanted <> "output" And wanted <> "parameter" Then
        Fail "causality: '" & wanted & "' is none of input, output, parameter"
    End If
    block = PlantBlock(args(0), key)
    kinds = Array("input", "output", "parameter")
    Set rows = New Collection
    Check ely_block_variable_count(block, count)
    For k = 0 To count - 1
        InfoRead block, k, info
        RtlMoveMemory VarPtr(causality), VarPtr(info(INFO_CAUSALITY)), 4
        If wanted = "" Or wanted = kinds(causality) Then
            display = InfoText(info, INFO_DISPLAY_UNIT)
            If display = "" Then display = InfoText(info, INFO_UNIT)
            rows.Add Array(InfoText(info, INFO_NAME), InfoText(info, INFO_UNIT), kinds(causality), display, _
                           InfoText(info, INFO_DESCRIPTION))
        End If
    Next
    ReDim out(0 To rows.count, 0 To 4)
    row = Array("name", "unit", "causality", "display unit", "description")
    For k = 0 To 4
        out(0, k) = row(k)
    Next
    n = 0
    For Each row In rows
        n = n + 1
        For k = 0 To 4
            out(n, k) = row(k)
        Next
    Next
    RunVariables = out
End Function

' The message of a call of another function with the given arguments (never an error value: a
' wrong func_name gives its message too).
Private Function RunMessage(ByVal args As Variant) As Variant
    Dim target As String, rest() As Variant, k As Long, message As String, failed As Long
    On Error GoTo failure
    target = TextArgument(args(0), "func_name")
    If UCase$(target) = "ELYMESSAGE" Or UCase$(target) = "MESSAGE" Then Fail "ELYMESSAGE explains a call of another function"
    If UBound(args) >= 1 Then
        ReDim rest(0 To UBound(args) - 1)
        For k = 1 To UBound(args)
            Bind rest(k - 1), args(k)
        Next
        ElyRun target, rest, message, failed
    Else
        ElyRun target, Array(), message, failed
    End If
    RunMessage = message
    Exit Function
failure:
    RunMessage = Err.Description
End Function

' ---- BEGIN GENERATED from adapters/spreadsheet/functions.json by generate.py (do not edit) ----

' Solves the plant at one operating point and returns one variable.
Public Function ELYSOLVE(plant As Variant, variable As Variant, ParamArray inputs() As Variant) As Variant
    Dim rest As Variant
    rest = inputs
    ELYSOLVE = ElyCall("ELYSOLVE", Array(plant, variable), rest)
End Function

' Solves the plant at one operating point and returns several variables, shaped like the range of their names (a row or a column).
Public Function ELYOUTPUTS(plant As Variant, variables As Variant, ParamArray inputs() As Variant) As Variant
    Dim rest As Variant
    rest = inputs
    ELYOUTPUTS = ElyCall("ELYOUTPUTS", Array(plant, variables), rest)
End Function

' Runs the plant in time through a profile (start-ups, ramps, temperature) and returns the chosen variables at each row's time, one row per profile row.
Public Function ELYPROFILE(plant As Variant, profile As Variant, outputs As Variant, ParamArray inputs() As Variant) As Variant
    Dim rest As Variant
    rest = inputs
    ELYPROFILE = ElyCall("ELYPROFILE", Array(plant, profile, outputs), rest)
End Function

' Runs the plant in time through a profile and returns the run summary: hydrogen, energy, specific energy, water, full-load hours, starts and more.
Public Function ELYSUMMARY(plant As Variant, profile As Variant, figures As Variant, ParamArray inputs() As Variant) As Variant
    Dim rest As Variant
    rest = inputs
    ELYSUMMARY = ElyCall("ELYSUMMARY", Array(plant, profile, figures), rest)
End Function

' Lists the plant's variables: a header row, then one row per variable with its name, SI unit, causality, display unit and description.
Public Function ELYVARIABLES(plant As Variant, Optional causality As Variant) As Variant
    If IsMissing(causality) Then causality = Empty
    ELYVARIABLES = ElyCall("ELYVARIABLES", Array(plant, causality), Array())
End Function

' The version of the elyblock library the functions use.
Public Function ELYVERSION() As Variant
    ELYVERSION = ElyCall("ELYVERSION", Array(), Array())
End Function

' The library's message for a call of another elyblock function with the same arguments: why it fails, the alarms it raised, or empty when it succeeds without one.
Public Function ELYMESSAGE(func_name As Variant, ParamArray arguments() As Variant) As Variant
    Dim rest As Variant
    rest = arguments
    ELYMESSAGE = ElyCall("ELYMESSAGE", Array(func_name), rest)
End Function

' The functions, for messages.
Private Function ElyFunctionList() As String
    ElyFunctionList = "ELYSOLVE, ELYOUTPUTS, ELYPROFILE, ELYSUMMARY, ELYVARIABLES, ELYVERSION, ELYMESSAGE"
End Function

' How many arguments each function takes before its repeated one and how many of them it
' requires (fixed = -1: no such function).
Private Sub ElyArity(ByVal name As String, ByRef fixed As Long, ByRef required As Long, ByRef repeated As Boolean)
    Select Case name
    Case "ELYSOLVE": fixed = 2: required = 2: repeated = True
    Case "ELYOUTPUTS": fixed = 2: required = 2: repeated = True
    Case "ELYPROFILE": fixed = 3: required = 3: repeated = True
    Case "ELYSUMMARY": fixed = 3: required = 3: repeated = True
    Case "ELYVARIABLES": fixed = 2: required = 1: repeated = False
    Case "ELYVERSION": fixed = 0: required = 0: repeated = False
    Case "ELYMESSAGE": fixed = 1: required = 1: repeated = True
    Case Else: fixed = -1
    End Select
End Sub

' Registers the functions' descriptions for Excel's Insert Function dialog (Excel 2010 and later).
' Run once after importing the module (Alt+F8, ElyblockRegister), e.g. from Workbook_Open.
Public Sub ElyblockRegister()
    Application.MacroOptions Macro:="ELYSOLVE", Category:="elyblock", _
        Description:="Solves the plant at one operating point and returns one variable.", _
        ArgumentDescriptions:=Array( _
            "The plant: a path to a JSON plant description (relative to this document's " & _
            "folder) or a two-column range of keys (stack.cells) and values (250, ""80 degC"").", _
            "The variable to return, e.g. ""product.hydrogen""; a unit in brackets converts " & _
            "it: ""product.hydrogen [kg/h]"". Without one the value is SI.", _
            "Optional pairs of input name and value: ""in.power""; ""15 MW"". A number is SI or " & _
            "in the unit of the name (""in.power [MW]""); a text may carry its unit. Setting a " & _
            "spec's drive input (in.power) or ""spec""; ""power"" chooses the spec.")
    Application.MacroOptions Macro:="ELYOUTPUTS", Category:="elyblock", _
        Description:="Solves the plant at one operating point and returns several variables, shaped " & _
            "like the range of their names (a row or a column).", _
        ArgumentDescriptions:=Array( _
            "The plant: a path to a JSON plant description or a two-column range of keys and " & _
            "values.", _
            "A row or column of variable names, each with an optional unit in brackets: " & _
            """cell.voltage"", ""product.hydrogen [kg/h]"". Empty cells give empty results.", _
            "Optional pairs of input name and value, as for ELYSOLVE.")
    Application.MacroOptions Macro:="ELYPROFILE", Category:="elyblock", _
        Description:="Runs the plant in time through a profile (start-ups, ramps, temperature) and " & _
            "returns the chosen variables at each row's time, one row per profile row.", _
        ArgumentDescriptions:=Array( _
            "The plant: a path to a JSON plant description or a two-column range of keys and " & _
            "values.", _
            "A header row, the time first (""time [h]""), then input columns (""power [MW]"", " & _
            """in.ambient_temperature [degC]""); then one row per time, each holding until the " & _
            "next.", _
            "A row of variable names, each with an optional unit in brackets: " & _
            """stack.temperature [degC]"", ""product.hydrogen [kg/h]"". Empty cells give empty " & _
            "columns.", _
            "Optional pairs of input name and value held over the run, as for ELYSOLVE: " & _
            """in.mode_request""; 3 (automatic: hot standby below the minimum load).")
    Application.MacroOptions Macro:="ELYSUMMARY", Category:="elyblock", _
        Description:="Runs the plant in time through a profile and returns the run summary: hydrogen, " & _
            "energy, specific energy, water, full-load hours, starts and more.", _
        ArgumentDescriptions:=Array( _
            "The plant: a path to a JSON plant description or a two-column range of keys and " & _
            "values.", _
            "A header row, the time first (""time [h]""), then input columns (""power [MW]""); " & _
            "then one row per time, as for ELYPROFILE.", _
            "Figure names with an optional unit in brackets (""hydrogen [t]""; SI without), " & _
            "their values shaped like the range; empty (""""): the whole summary as rows of " & _
            "figure, value, unit, label.", _
            "Optional pairs of input name and value held over the run, as for ELYPROFILE.")
    Application.MacroOptions Macro:="ELYVARIABLES", Category:="elyblock", _
        Description:="Lists the plant's variables: a header row, then one row per variable with its " & _
            "name, SI unit, causality, display unit and description.", _
        ArgumentDescriptions:=Array( _
            "The plant: a path to a JSON plant description or a two-column range of keys and " & _
            "values.", _
            "Optional: only the variables of this causality, ""input"", ""output"" or " & _
            """parameter"".")
    Application.MacroOptions Macro:="ELYVERSION", Category:="elyblock", _
        Description:="The version of the elyblock library the functions use."
    Application.MacroOptions Macro:="ELYMESSAGE", Category:="elyblock", _
        Description:="The library's message for a call of another elyblock function with the same " & _
            "arguments: why it fails, the alarms it raised, or empty when it succeeds " & _
            "without one.", _
        ArgumentDescriptions:=Array( _
            "The function whose call to explain, e.g. ""ELYSOLVE"".", _
            "The arguments of that call, as they are written in it.")
End Sub
' ---- END GENERATED ----
